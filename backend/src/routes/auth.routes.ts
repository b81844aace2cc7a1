// Sign-in, sign-out, the CSRF token, who am I, and password change (docs/api.md, "Authentication").
import { Router, type RequestHandler } from 'express';
import type { PassportStatic } from 'passport';
import { changePasswordBodySchema, loginBodySchema } from '../contracts/auth';
import { InvalidCredentialsError } from '../errors';
import { csrfTokenFor } from '../middleware/csrf';
import { signedInUserId } from '../middleware/guards';
import { sessionCookieName } from '../middleware/session';
import type { Services } from '../services';
import { authenticateLocal, destroySession, logIn, saveSession } from './promisified';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createAuthRouter(deps: {
  services: Services;
  passport: PassportStatic;
  loginLimiters: RequestHandler[];
  passwordLimiter: RequestHandler;
}): RouteTableRouter {
  const { accounts } = deps.services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/auth/csrf',
      access: 'public',
      handler: async ({ req, res }) => {
        const token = csrfTokenFor(req.session);
        // Anonymous sessions are only stored once they hold a token (saveUninitialized is off).
        await saveSession(req);
        res.json({ token });
      },
    }),
    route({
      method: 'post',
      path: '/auth/login',
      access: 'public',
      before: deps.loginLimiters,
      body: loginBodySchema,
      handler: async ({ req, res, body }) => {
        req.body = body; // the strategy reads the normalised e-mail
        const user = await authenticateLocal(deps.passport, req, res);
        if (!user) throw new InvalidCredentialsError();
        await logIn(req, user);
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
      before: [deps.passwordLimiter],
      body: changePasswordBodySchema,
      handler: async ({ req, res, body }) => {
        await accounts.changePassword(signedInUserId(req), body.currentPassword, body.newPassword, req.sessionID);
        res.status(204).end();
      },
    }),
  ]);
}
