// Authorization guards. Every route in a route table names its guards explicitly (deny by default):
// `publicRoute`, `requireSignedIn`, or `requireClubRole([...])` for routes under /clubs/:clubId.
// A club the caller does not belong to answers 404 (its existence is not revealed), a club they
// belong to without the role answers 403.
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { ClubRole } from '../entities';
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

/** Open to anyone, signed in or not. Saying so is required: a route without guards does not mount. */
export const publicRoute: Guard = guard('public', () => undefined);

export const requireSignedIn: Guard = guard('signedIn', (req) => {
  signedInUserId(req);
});

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Signed in, a member of `:clubId`, holding at least one of `roles`. */
export function requireClubRole(roles: readonly ClubRole[]): Guard {
  return guard(`clubRole(${roles.join('|')})`, async (req, res) => {
    const userId = signedInUserId(req);
    const clubId = req.params.clubId;
    if (typeof clubId !== 'string' || !uuidPattern.test(clubId)) throw new NotFoundError('Club not found.');
    const held = await servicesOf(req).members.rolesInClub(userId, clubId);
    if (held === null) throw new NotFoundError('Club not found.');
    if (!roles.some((r) => held.includes(r))) throw new ForbiddenError();
    res.locals.clubRoles = held;
  });
}
