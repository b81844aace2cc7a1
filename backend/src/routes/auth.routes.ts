// Sign-in, sign-out, the CSRF token, who am I, and password change (docs/api.md, "Authentication").
import { Router } from 'express';
import type { PassportStatic } from 'passport';
import { changePasswordBodySchema, loginBodySchema } from '../contracts/auth';
import { InvalidCredentialsError } from '../errors';
import { clientKey } from '../middleware/client-key';
import type { CsrfProtection } from '../middleware/csrf';
import { signedInUserId } from '../middleware/guards';
import { sessionCookieName } from '../middleware/session';
import type { Services } from '../services';
import type { Limits } from '../services/limits';
import { authenticateLocal, destroySession, logIn, saveSession } from './promisified';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createAuthRouter(deps: { services: Services; passport: PassportStatic; limits: Limits; csrf: CsrfProtection }): RouteTableRouter {
  const { accounts } = deps.services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/auth/csrf',
      access: 'public',
      handler: async ({ req, res }) => {
        const token = deps.csrf.tokenFor(req, res);
        // A signed-in session stores its new token now; an anonymous caller's lives in a cookie only.
        if (req.user) await saveSession(req);
        res.json({ token });
      },
    }),
    route({
      method: 'post',
      path: '/auth/login',
      access: 'public',
      body: loginBodySchema,
      handler: async ({ req, res, body }) => {
        // Refused here past a limit, or slowed down after failures for this e-mail from anywhere.
        const attempt = await deps.limits.signIn.begin(body.email, clientKey(req));
        req.body = body; // the strategy reads the normalised e-mail
        const user = await authenticateLocal(deps.passport, req, res);
        if (!user) throw new InvalidCredentialsError();
        await attempt.succeeded();
        await logIn(req, user);
        await accounts.endOldestSessions(user.id, req.sessionID);
        res.json(await accounts.sessionView(user.id));
      },
    }),
    route({
      method: 'post',
      path: '/auth/logout',
      access: 'public',
      handler: async ({ req, res }) => {
        await destroySession(req);
        res.clearCookie(sessionCookieName, { path: '/', httpOnly: true, sameSite: 'lax' });
        res.status(204).end();
      },
    }),
    route({
      method: 'get',
      path: '/auth/me',
      access: 'signedIn',
      handler: async ({ req, res }) => {
        res.json(await accounts.sessionView(signedInUserId(req)));
      },
    }),
    route({
      method: 'post',
      path: '/auth/password',
      access: 'signedIn',
      body: changePasswordBodySchema,
      handler: async ({ req, res, body }) => {
        const userId = signedInUserId(req);
        const attempt = await deps.limits.passwordChange.begin(userId);
        // A wrong current password throws here, and the attempt stays counted against this user.
        await accounts.changePassword(userId, body.currentPassword, body.newPassword, req.sessionID);
        await attempt.succeeded();
        res.status(204).end();
      },
    }),
  ]);
}
