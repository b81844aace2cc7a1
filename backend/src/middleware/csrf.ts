// CSRF protection with a synchronizer token: one random token per session, handed out by
// GET /api/auth/csrf and required in the X-CSRF-Token header on every state-changing request.
// Sign-in and sign-out replace the session, and with it the token.
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { RequestHandler } from 'express';
import type { Session, SessionData } from 'express-session';
import { CsrfError } from '../errors';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/** The session's token, created on first use. Setting it marks the session for saving. */
export function csrfTokenFor(session: Session & Partial<SessionData>): string {
  session.csrfToken ??= randomBytes(32).toString('base64url');
  return session.csrfToken;
}

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

export const requireCsrfToken: RequestHandler = (req, _res, next) => {
  if (safeMethods.has(req.method)) return next();
  const sent = req.get('x-csrf-token');
  const expected = req.session?.csrfToken;
  if (!sent || !expected || !sameToken(sent, expected)) return next(new CsrfError());
  next();
};
