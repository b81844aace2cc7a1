// Check runs of a build sheet and the PDF report of a run (docs/api.md, "Garage"). The owner runs
// checks; the owner and the club's stewards and admins list them and read the report.
import { Router } from 'express';
import { checkRunParamsSchema, reportQuerySchema, sheetParamsSchema } from '../contracts/garage';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createCheckRunsReportRouter({ services }: { services: Services }): RouteTableRouter {
  const { reports } = services;
  return mountRoutes(Router(), [
    route({
      method: 'post', path: '/build-sheets/:sheetId/check-runs', access: 'sheet.edit', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.status(201).json({ checkRun: await reports.runCheck(params.sheetId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/check-runs', access: 'sheet.read', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ checkRuns: await reports.list(params.sheetId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get', path: '/check-runs/:checkRunId/report.pdf', access: 'checkRun.read', params: checkRunParamsSchema, query: reportQuerySchema,
      handler: async ({ req, res, params, query }) => {
        const { pdf, verificationCode } = await reports.pdf(params.checkRunId, signedInUserId(req), query.units);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', `inline; filename="cagewright-pre-check-${verificationCode}.pdf"`);
        // The car, the photos and the builder's units can change, so the PDF is made fresh each time.
        res.setHeader('Cache-Control', 'private, no-cache');
        res.end(pdf);
      },
    }),
  ]);
}
