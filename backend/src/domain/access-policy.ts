// The one access policy: who may read or change a club's, a car's, a sheet's, a submission's things.
// Pure: every rule takes the facts a service has already loaded (the caller, their roles in the club
// that owns the thing, its owner, whether it is a draft) and answers allowed, or refused with the status
// the API gives. Routes name their rule (route tables' `access`), services ask `decide` with the facts,
// and tests/api/access-matrix.test.ts checks every mounted route against the table of docs/api.md.
//
// Two answers for a refusal, always the same way round: a thing the caller may not see at all is 404,
// exactly as for an id that does not exist (nobody learns which ids are in use); a thing they may see
// but not change is 403. Signed out is 401 before anything else.

import { CLUB_ROLES, type ClubRole } from '../contracts/roles.js';

export type { ClubRole };

/** The caller's roles in the club that owns the thing; null when they are not a member. */
export type ClubRoles = readonly ClubRole[] | null;

export interface AccessFacts {
  /** The signed-in caller, or null. */
  actorId: string | null;
  /** The caller's roles in the owning club (null: not a member). */
  roles?: ClubRoles;
  /** Roles the caller holds in any club (for the rules that are not about one club). */
  rolesAnywhere?: readonly ClubRole[];
  /** Who owns the thing: a car's owner (also for its sheets and records), a submission's builder, a run's creator. */
  ownerId?: string | null;
  /** A ruleset version that is still a draft: only the club's admins know it exists. */
  draft?: boolean;
  /** A car transfer's buyer (its `ownerId` is the seller who offered it). */
  recipientId?: string | null;
}

export type Refusal = { allowed: false; status: 401 | 403 | 404 };
export type Verdict = { allowed: true } | Refusal;

const allow: Verdict = { allowed: true };
const signedOut: Refusal = { allowed: false, status: 401 };
const hidden: Refusal = { allowed: false, status: 404 };
const forbidden: Refusal = { allowed: false, status: 403 };

const has = (roles: ClubRoles | undefined, ...wanted: ClubRole[]) => !!roles && roles.some((r) => wanted.includes(r));
const isMember = (roles: ClubRoles | undefined) => !!roles && roles.length > 0;
const isReviewer = (roles: ClubRoles | undefined) => has(roles, 'steward', 'admin');
const isOwner = (f: AccessFacts) => f.actorId !== null && !!f.ownerId && f.ownerId === f.actorId;

/** Members of the club: wanted role → allowed; a member without it → 403; anyone else → 404. */
function clubRole(f: AccessFacts, ...wanted: ClubRole[]): Verdict {
  if (!isMember(f.roles)) return hidden;
  return has(f.roles, ...wanted) ? allow : forbidden;
}

/** A version is seen by the members of its club, a draft only by its admins. */
function seesVersion(f: AccessFacts): boolean {
  return isMember(f.roles) && (!f.draft || has(f.roles, 'admin'));
}

/** The owner, and the club's stewards and admins, see a car's sheets, their photos, journal, runs and records. */
function ownerOrReviewer(f: AccessFacts): Verdict {
  return isOwner(f) || isReviewer(f.roles) ? allow : hidden;
}

interface AccessRule {
  /** The rule in plain words, for docs/api.md and the OpenAPI document. */
  summary: string;
  /** What the rule is about: the route parameter or body field that names it (none: no one thing). */
  subject: 'none' | 'self' | 'club' | 'car' | 'sheet' | 'checkRun' | 'version' | 'rulebook' | 'submission' | 'record' | 'job' | 'transfer';
  decide(f: AccessFacts): Verdict;
}

function rule(subject: AccessRule['subject'], summary: string, decide: (f: AccessFacts) => Verdict): AccessRule {
  return { subject, summary, decide };
}

/**
 * Every rule the API uses. A signed-out caller is refused with 401 by every rule but `public` before
 * the rule's own decision (see `decide`).
 */
export const ACCESS_RULES = {
  public: rule('none', 'Anyone, signed in or not.', () => allow),
  signedIn: rule('self', 'Anyone signed in; it reads or changes only their own things.', () => allow),
  'self.builder': rule('self', 'Anyone holding the builder role in some club (403 otherwise).', (f) =>
    has(f.rolesAnywhere ?? null, 'builder') ? allow : forbidden),

  'club.member': rule('club', 'Members of the club (404 for anyone else).', (f) => clubRole(f, ...CLUB_ROLES)),
  'club.reviewer': rule('club', 'Stewards and admins of the club (403 for its other members, 404 for anyone else).', (f) => clubRole(f, 'steward', 'admin')),
  'club.steward': rule('club', 'Stewards of the club (403 for its other members, 404 for anyone else).', (f) => clubRole(f, 'steward')),
  'club.admin': rule('club', 'Admins of the club (403 for its other members, 404 for anyone else).', (f) => clubRole(f, 'admin')),
  'anyClub.admin': rule('self', 'Admins of any club (403 otherwise).', (f) => (has(f.rolesAnywhere ?? null, 'admin') ? allow : forbidden)),

  'car.owner': rule('car', 'The car’s owner (404 for anyone else).', (f) => (isOwner(f) ? allow : hidden)),
  'car.addSheet': rule('car', 'The car’s owner (404 for anyone else), holding the builder role in the sheet’s club (404 when not a member, 403 without the role).', (f) =>
    !isOwner(f) ? hidden : clubRole(f, 'builder')),

  'sheet.read': rule('sheet', 'The car’s owner and the stewards and admins of the sheet’s club (404 for anyone else).', ownerOrReviewer),
  'sheet.edit': rule('sheet', 'The car’s owner; the club’s stewards and admins, who read it, get 403; anyone else 404.', (f) =>
    isOwner(f) ? allow : isReviewer(f.roles) ? forbidden : hidden),

  'checkRun.read': rule('checkRun', 'Whoever saved the run, and the stewards and admins of its ruleset’s club (404 for anyone else).', ownerOrReviewer),

  'version.read': rule('version', 'Members of the club that owns the rulebook; a draft only its admins (404 for anyone else).', (f) => (seesVersion(f) ? allow : hidden)),
  'version.admin': rule('version', 'Admins of the club that owns the rulebook; members who see the version get 403, anyone else 404.', (f) =>
    !seesVersion(f) ? hidden : has(f.roles, 'admin') ? allow : forbidden),
  'rulebook.admin': rule('rulebook', 'Admins of the club that owns the rulebook (403 for its other members, 404 for anyone else).', (f) => clubRole(f, 'admin')),

  'submission.create': rule('checkRun', 'The builder who owns the checked sheet; stewards and admins who read it get 403, anyone else 404. The review workflow then asks for the builder role in the club.', (f) =>
    isOwner(f) ? allow : isReviewer(f.roles) ? forbidden : hidden),
  'submission.read': rule('submission', 'The builder who submitted it and the club’s stewards and admins (404 for anyone else).', ownerOrReviewer),
  'submission.act': rule('submission', 'Whoever sees the submission; the review workflow then decides by role and state (403 for the wrong person, 409 for the wrong state).', ownerOrReviewer),
  'submission.resubmit': rule('submission', 'The builder who submitted it; the club’s stewards and admins get 403, anyone else 404.', (f) =>
    isOwner(f) ? allow : isReviewer(f.roles) ? forbidden : hidden),
  'submission.annotate': rule('submission', 'The club’s stewards, never on their own submission (403 for the builder and admins who are not stewards, 404 for anyone else).', (f) => {
    if (!isOwner(f) && !isReviewer(f.roles)) return hidden;
    return has(f.roles, 'steward') && !isOwner(f) ? allow : forbidden;
  }),

  'record.read': rule('record', 'The car’s owner and the stewards and admins of the record’s club (404 for anyone else).', ownerOrReviewer),
  'record.revoke': rule('record', 'The stewards and admins of the record’s club; the car’s owner gets 403, anyone else 404.', (f) =>
    isReviewer(f.roles) ? allow : isOwner(f) ? forbidden : hidden),
  'record.inspect': rule('record', 'The stewards and admins of the record’s club, never on their own car (403 for the car’s owner, 404 for anyone else).', (f) =>
    !isReviewer(f.roles) ? (isOwner(f) ? forbidden : hidden) : isOwner(f) ? forbidden : allow),

  'transfer.recipient': rule('transfer', 'The person the car is offered to; the seller who offered it gets 403, anyone else 404.', (f) =>
    f.actorId !== null && f.recipientId === f.actorId ? allow : isOwner(f) ? forbidden : hidden),
  'transfer.sender': rule('transfer', 'The seller who offered the car; the person it is offered to gets 403, anyone else 404.', (f) =>
    isOwner(f) ? allow : f.actorId !== null && f.recipientId === f.actorId ? forbidden : hidden),

  'job.admin': rule('job', 'Admins of the job’s club (403 for its other members, 404 for anyone else and for jobs of no club).', (f) => clubRole(f, 'admin')),
} satisfies Record<string, AccessRule>;

export type AccessRuleName = keyof typeof ACCESS_RULES;

export const accessRuleNames = Object.keys(ACCESS_RULES) as AccessRuleName[];

/** The verdict of `name` for these facts. Every rule but `public` refuses a signed-out caller with 401. */
export function decide(name: AccessRuleName, facts: AccessFacts): Verdict {
  const r: AccessRule = ACCESS_RULES[name];
  if (name !== 'public' && facts.actorId === null) return signedOut;
  return r.decide(facts);
}

/** True when `name` lets the caller through: for the "may I" flags of views (canEdit, canRevoke, drafts shown). */
export function allows(name: AccessRuleName, facts: AccessFacts): boolean {
  return decide(name, facts).allowed;
}

/** Every refusal `name` can give, found by asking it about every kind of caller and thing (for the OpenAPI document). */
export function refusalsOf(name: AccessRuleName): Refusal['status'][] {
  const seen = new Set<Refusal['status']>();
  const roleSets: ClubRoles[] = [null, ['builder'], ['steward'], ['admin'], ['admin', 'steward']];
  for (const actorId of [null, 'caller'])
    for (const ownerId of ['caller', 'someone else'])
      for (const roles of roleSets)
        for (const rolesAnywhere of roleSets)
          for (const draft of [false, true]) {
            const v = decide(name, { actorId, ownerId, roles, rolesAnywhere: rolesAnywhere ?? [], draft });
            if (!v.allowed) seen.add(v.status);
          }
  return [...seen].sort((a, b) => a - b);
}

export function accessRule(name: AccessRuleName): { summary: string; subject: AccessRule['subject'] } {
  const r: AccessRule = ACCESS_RULES[name];
  return { summary: r.summary, subject: r.subject };
}

/** Rules decided from the caller's roles in the club named by the route's `:clubId` (the route guard asks). */
export const clubRules = ['club.member', 'club.reviewer', 'club.steward', 'club.admin'] as const satisfies readonly AccessRuleName[];
export type ClubRuleName = (typeof clubRules)[number];
export const isClubRule = (name: AccessRuleName): name is ClubRuleName => (clubRules as readonly string[]).includes(name);
