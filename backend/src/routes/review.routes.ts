// The club's review queue and the stewards' mail opt-in (docs/api.md, "Review and cage records").
// Stewards and admins of the club read the queue; only stewards opt in to mail.
import { Router } from 'express';
import { clubParamsSchema, queueQuerySchema, reviewMailBodySchema } from '../contracts/review';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createReviewRouter({ services }: { services: Services }): RouteTableRouter {
  const { review, reviewReader } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/clubs/:clubId/submissions', access: 'club.reviewer', params: clubParamsSchema, query: queueQuerySchema,
      handler: async ({ req, res, params, query }) => {
        res.json(await reviewReader.queue(params.clubId, signedInUserId(req), query));
      },
    }),
    route({
      method: 'get', path: '/clubs/:clubId/review-mail', access: 'club.steward', params: clubParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ enabled: await review.mailOptIn(params.clubId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'put', path: '/clubs/:clubId/review-mail', access: 'club.steward', params: clubParamsSchema, body: reviewMailBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ enabled: await review.setMailOptIn(params.clubId, signedInUserId(req), body.enabled) });
      },
    }),
  ]);
}
