// Background job progress, for admins of the job's club (docs/api.md, "Background jobs").
import { Router } from 'express';
import { jobParamsSchema } from '../contracts/jobs';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import type { JobControl } from '../services/jobs';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createJobsRouter({ services, control }: { services: Services; control: JobControl | null }): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/jobs/:id',
      access: 'job.admin',
      params: jobParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ job: await services.jobProgress.forAdmin(signedInUserId(req), params.id) });
      },
    }),
    route({
      method: 'post',
      path: '/jobs/:id/retry',
      access: 'job.admin',
      params: jobParamsSchema,
      handler: async ({ req, res, params }) => {
        res.status(202).json({ job: await services.jobProgress.retryForAdmin(signedInUserId(req), params.id, control) });
      },
    }),
  ]);
}
