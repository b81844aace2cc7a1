// A club's activity log, for that club's admins (docs/api.md, "Activity log").
import { Router } from 'express';
import { auditQuerySchema } from '../contracts/audit';
import { clubParamsSchema } from '../contracts/clubs';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createAuditRouter({ services }: { services: Services }): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/clubs/:clubId/audit',
      access: 'club.admin',
      params: clubParamsSchema,
      query: auditQuerySchema,
      handler: async ({ req, res, params, query }) => {
        res.json(await services.audit.list(params.clubId, signedInUserId(req), query));
      },
    }),
  ]);
}
