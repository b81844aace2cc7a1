// Promise wrappers for the callback APIs of passport and express-session, so handlers can await them.
import type { Request, Response } from 'express';
import type { PassportStatic } from 'passport';

/** Runs the passport-local strategy on this request; resolves to the user or false. */
export function authenticateLocal(passport: PassportStatic, req: Request, res: Response): Promise<Express.User | false> {
  return new Promise((resolve, reject) => {
    const middleware = passport.authenticate('local', { session: false }, (err: unknown, user: Express.User | false) =>
      err ? reject(err) : resolve(user),
    ) as (req: Request, res: Response, next: (err?: unknown) => void) => void;
    middleware(req, res, reject);
  });
}

/** Signs in: passport 0.7 regenerates the session (new id, nothing carried over, no CSRF token). */
export function logIn(req: Request, user: Express.User): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (err: unknown) => (err ? reject(err) : resolve())));
}

export function destroySession(req: Request): Promise<void> {
  return new Promise((resolve, reject) => {
    if (!req.session) return resolve();
    req.session.destroy((err: unknown) => (err ? reject(err) : resolve()));
  });
}

/** Saves the session now, so a store failure becomes this request's error, not a lost write. */
export function saveSession(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.save((err: unknown) => (err ? reject(err) : resolve())));
}
