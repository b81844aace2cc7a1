// Password reset by e-mail (docs/api.md, "Authentication and account"): ask for a link, look one up,
// set the new password with it. Asking answers the same, in about the same time, whether or not the
// address has an account.
import { Router } from 'express';
import {
  passwordResetBodySchema,
  passwordResetRequestBodySchema,
  passwordResetTokenParamsSchema,
  type PasswordResetRequestedWire,
} from '../contracts/auth';
import { NotFoundError } from '../errors';
import { clientKey } from '../middleware/client-key';
import type { Services } from '../services';
import type { Limits } from '../services/limits';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

/**
 * Asking never answers sooner than this after it arrived, so the extra work for a real account (a link
 * stored, a mail queued) does not show in the response time.
 */
export const resetAnswerFloorMs = 400;

export const resetRequested: PasswordResetRequestedWire = {
  message: 'If an account uses this address, a link to choose a new password is on its way. It works once, within an hour.',
};

// A malformed token is just an unknown one: the same 404 as any link that cannot be used.
function tokenOf(params: Record<string, string>): string {
  const parsed = passwordResetTokenParamsSchema.safeParse(params);
  if (!parsed.success) throw new NotFoundError('This link has expired or was already used. Ask for a new one.');
  return parsed.data.token;
}

export function createPasswordResetRouter({ services, limits }: { services: Services; limits: Limits }): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'post',
      path: '/auth/password-reset',
      access: 'public',
      body: passwordResetRequestBodySchema,
      handler: async ({ req, res, body }) => {
        const answerAt = Date.now() + resetAnswerFloorMs;
        // Past the per-IP limit: 429. Past the per-address limit: the same answer, but no new mail.
        const { mayMail } = await limits.passwordReset.begin(body.email, clientKey(req));
        if (mayMail) await services.passwordResets.request(body.email);
        const wait = answerAt - Date.now();
        if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
        res.status(202).json(resetRequested);
      },
    }),
    route({
      method: 'get',
      path: '/auth/password-reset/:token',
      access: 'public',
      handler: async ({ res, params }) => {
        res.json(await services.passwordResets.lookup(tokenOf(params)));
      },
    }),
    route({
      method: 'post',
      path: '/auth/password-reset/:token',
      access: 'public',
      body: passwordResetBodySchema,
      handler: async ({ req, res, params, body }) => {
        await services.passwordResets.complete(tokenOf(params), body.password, req.sessionID);
        res.status(204).end();
      },
    }),
  ]);
}
