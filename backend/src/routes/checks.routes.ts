// Dry-run checks and saved check runs (docs/api.md, "Rulesets and checks"). Saved runs are made
// from build sheets (their routes call services.checks.saveRun); here they are only read.
import { Router } from 'express';
import { checkRunCodeParamsSchema, checkRunParamsSchema, dryRunBodySchema } from '../contracts/checks';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createChecksRouter({ services }: { services: Services }): RouteTableRouter {
  const { checks } = services;
  return mountRoutes(Router(), [
    route({
      method: 'post',
      path: '/checks',
      // The version's club is known only after loading it, so the service checks membership.
      access: 'version.read',
      body: dryRunBodySchema,
      handler: async ({ req, res, body }) => {
        // The report arrives as JSON text from the check engine; wrapping it avoids a second serialisation.
        const reportJson = await checks.dryRunJson({ ...body, userId: signedInUserId(req) });
        res.type('application/json').send(`{"report":${reportJson}}`);
      },
    }),
    route({
      // Before '/check-runs/:id', whose id must be a UUID.
      method: 'get',
      path: '/check-runs/by-code/:code',
      access: 'checkRun.read',
      params: checkRunCodeParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ checkRun: await checks.getRunByCode(params.code, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get',
      path: '/check-runs/:id',
      access: 'checkRun.read',
      params: checkRunParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ checkRun: await checks.getRun(params.id, signedInUserId(req)) });
      },
    }),
  ]);
}
