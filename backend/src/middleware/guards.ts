// Authorization guards, made from the route's access rule (domain/access-policy.ts): every route in a
// route table names its rule, and `guardFor` turns it into the middleware that runs before validation.
// `public` lets anyone in; the club rules read the caller's roles in `:clubId` and ask the policy (a club
// they do not belong to answers 404, its existence not revealed; a club they belong to without the role
// answers 403); `anyClub.admin` asks about the caller's roles anywhere. Every other rule is about one
// thing (a sheet, a submission) that only its service loads: the guard demands a session, and the
// service asks the same policy with the thing's owner and club (services/access.ts).
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { decide, isClubRule, type AccessRuleName, type ClubRuleName } from '../domain/access-policy';
import { ForbiddenError, NotFoundError, UnauthenticatedError } from '../errors';
import type { Services } from '../services';

export type Guard = RequestHandler & { readonly guardName: string };

function guard(guardName: string, fn: (req: Request, res: Response) => Promise<void> | void): Guard {
  const handler = (req: Request, res: Response, next: NextFunction) => {
    Promise.resolve(fn(req, res)).then(() => next(), next);
  };
  return Object.assign(handler, { guardName });
}

/** Services live on app.locals so that guards can be plain values in route tables. */
export function servicesOf(req: Request): Services {
  return (req.app.locals as { services: Services }).services;
}

export function signedInUserId(req: Request): string {
  if (!req.user) throw new UnauthenticatedError();
  return req.user.id;
}

/** Open to anyone, signed in or not. */
export const publicRoute: Guard = guard('public', () => undefined);

export const requireSignedIn: Guard = guard('signedIn', (req) => {
  signedInUserId(req);
});

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Signed in, and `rule` allows the caller's roles in `:clubId`; the roles are left in res.locals.clubRoles. */
function clubGuard(rule: ClubRuleName): Guard {
  return guard(rule, async (req, res) => {
    const userId = signedInUserId(req);
    const clubId = req.params.clubId;
    if (typeof clubId !== 'string' || !uuidPattern.test(clubId)) throw new NotFoundError('Club not found.');
    const roles = await servicesOf(req).access.rolesIn(userId, clubId);
    const verdict = decide(rule, { actorId: userId, roles });
    if (!verdict.allowed) throw verdict.status === 403 ? new ForbiddenError() : new NotFoundError('Club not found.');
    res.locals.clubRoles = roles;
  });
}

const anyClubAdmin: Guard = guard('anyClub.admin', async (req) => {
  const userId = signedInUserId(req);
  const verdict = decide('anyClub.admin', { actorId: userId, rolesAnywhere: await servicesOf(req).access.rolesAnywhere(userId) });
  if (!verdict.allowed) throw new ForbiddenError();
});

const clubGuards = new Map<ClubRuleName, Guard>();

/** The guard of a route whose access is `rule`. */
export function guardFor(rule: AccessRuleName): Guard {
  if (rule === 'public') return publicRoute;
  if (rule === 'anyClub.admin') return anyClubAdmin;
  if (isClubRule(rule)) {
    let g = clubGuards.get(rule);
    if (!g) clubGuards.set(rule, (g = clubGuard(rule)));
    return g;
  }
  return requireSignedIn;
}
