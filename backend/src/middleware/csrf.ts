// CSRF protection (docs/decisions/0011-csrf-without-anonymous-sessions.md). Every state-changing request
// carries the token from GET /api/auth/csrf in the X-CSRF-Token header, checked two ways:
// - signed in: a synchronizer token kept in the session (sign-in and sign-out replace the session, and
//   with it the token);
// - anonymous (signing in, accepting an invitation, asking for a password reset): a signed double-submit
//   cookie (csrf-csrf), so a visitor who only fetches a token stores nothing on the server.
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import type { Session, SessionData } from 'express-session';
import { doubleCsrf } from 'csrf-csrf';
import { CsrfError } from '../errors';

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

export const csrfCookieName = 'cw.csrf';
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

export interface CsrfProtection {
  /** The token for this caller: the session's when signed in, else a fresh cookie-bound one. */
  tokenFor(req: Request, res: Response): string;
  /** Refuses a state-changing request without the right token (403 csrf_failed). */
  middleware: RequestHandler;
}

/** Needs cookie-parser before it (req.cookies). */
export function createCsrfProtection(sessionSecret: string): CsrfProtection {
  // A key of its own, derived from the session secret, so a cookie signature never doubles as a CSRF one.
  const secret = createHmac('sha256', sessionSecret).update('cagewright csrf cookie').digest('base64url');
  const anonymous = doubleCsrf({
    getSecret: () => secret,
    // There is no session to bind to (that is the point); the cookie itself is the binding.
    getSessionIdentifier: () => 'anonymous',
    cookieName: csrfCookieName,
    cookieOptions: { sameSite: 'strict', path: '/api', httpOnly: true, secure: false },
    getCsrfTokenFromRequest: (req) => req.get('x-csrf-token'),
  });

  return {
    tokenFor(req, res) {
      if (req.user) return csrfTokenFor(req.session);
      return anonymous.generateCsrfToken(req, res, { cookieOptions: { secure: req.secure } });
    },
    middleware(req, _res, next) {
      if (safeMethods.has(req.method)) return next();
      if (req.user) {
        const sent = req.get('x-csrf-token');
        const expected = req.session?.csrfToken;
        return next(sent && expected && sameToken(sent, expected) ? undefined : new CsrfError());
      }
      next(anonymous.validateRequest(req) ? undefined : new CsrfError());
    },
  };
}
