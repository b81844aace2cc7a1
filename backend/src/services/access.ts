// The access policy's edge in the services: the facts it needs from the database (a caller's roles in
// a club, or in any club) and `enforce`, which asks the pure policy (domain/access-policy.ts) and turns
// a refusal into the typed error with the thing's own words ("Build sheet not found."). Every service
// that decides who may see or change something goes through here; none compares roles itself.
import type { DataSource, EntityManager } from 'typeorm';
import { decide, type AccessFacts, type AccessRuleName, type ClubRole } from '../domain/access-policy';
import { ForbiddenError, NotFoundError, UnauthenticatedError } from '../errors';

export interface RefusalWords {
  /** The 404's message: the same as for an id that does not exist. */
  notFound: string;
  /** The 403's message (default: the generic one). */
  forbidden?: string;
}

/** Throws 401/403/404 unless `rule` lets the caller through. */
export function enforce(rule: AccessRuleName, facts: AccessFacts, words: RefusalWords): void {
  const verdict = decide(rule, facts);
  if (verdict.allowed) return;
  if (verdict.status === 401) throw new UnauthenticatedError();
  if (verdict.status === 403) throw new ForbiddenError(words.forbidden);
  throw new NotFoundError(words.notFound);
}

/** The caller's roles in `clubId`, or null when they are not a member. */
export async function rolesIn(em: EntityManager, userId: string, clubId: string): Promise<ClubRole[] | null> {
  const rows: { roles: ClubRole[] }[] = await em.query(`SELECT roles FROM memberships WHERE user_id = $1 AND club_id = $2`, [userId, clubId]);
  return rows[0] ? [...rows[0].roles] : null;
}

/** Every role the caller holds in any club, once each. */
export async function rolesAnywhere(em: EntityManager, userId: string): Promise<ClubRole[]> {
  const rows: { role: ClubRole }[] = await em.query(`SELECT DISTINCT unnest(roles) AS role FROM memberships WHERE user_id = $1`, [userId]);
  return rows.map((r) => r.role);
}

export type AccessReader = ReturnType<typeof createAccessReader>;

/** The same look-ups for the route guards, which have the services but no EntityManager. */
export function createAccessReader(ds: DataSource) {
  return {
    rolesIn: (userId: string, clubId: string) => rolesIn(ds.manager, userId, clubId),
    rolesAnywhere: (userId: string) => rolesAnywhere(ds.manager, userId),
  };
}
