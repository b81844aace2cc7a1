// Invitation links: look one up, and accept it (sets the password and signs in).
import { Router } from 'express';
import { acceptInvitationBodySchema, invitationTokenParamsSchema } from '../contracts/auth';
import { NotFoundError } from '../errors';
import type { Services } from '../services';
import { logIn } from './promisified';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

// A malformed token is just an unknown one: answer 404, as for any invitation that cannot be used.
function tokenOf(params: Record<string, string>): string {
  const parsed = invitationTokenParamsSchema.safeParse(params);
  if (!parsed.success) throw new NotFoundError('This invitation link is not valid any more. Ask the club admin for a new one.');
  return parsed.data.token;
}

export function createInvitationsRouter({ services }: { services: Services }): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/invitations/:token',
      access: 'public',
      handler: async ({ res, params }) => {
        res.json(await services.members.getInvitation(tokenOf(params)));
      },
    }),
    route({
      method: 'post',
      path: '/invitations/:token/accept',
      access: 'public',
      body: acceptInvitationBodySchema,
      handler: async ({ req, res, params, body }) => {
        const userId = await services.members.acceptInvitation(tokenOf(params), body.password, body.displayName);
        await logIn(req, { id: userId });
        res.json(await services.accounts.sessionView(userId));
      },
    }),
  ]);
}
