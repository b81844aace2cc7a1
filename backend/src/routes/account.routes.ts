// PATCH /api/account: the signed-in user's own name and preferred units.
import { Router } from 'express';
import { updateAccountBodySchema } from '../contracts/auth';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createAccountRouter({ services }: { services: Services }): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'patch',
      path: '/account',
      access: 'signedIn',
      body: updateAccountBodySchema,
      handler: async ({ req, res, body }) => {
        res.json({ user: await services.accounts.updateAccount(signedInUserId(req), body) });
      },
    }),
  ]);
}
