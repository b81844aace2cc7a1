// Submissions of check runs for review (docs/api.md, "Review and cage records"): the builder submits,
// resubmits and withdraws; the club's stewards claim, waive, annotate and decide. Access (404 for
// anyone who may not see it, 403 for the wrong role) is decided by the review services.
import { Router } from 'express';
import { reportQuerySchema } from '../contracts/garage';
import { actionBodySchema, annotationBodySchema, mySubmissionsQuerySchema, resubmitBodySchema, submissionParamsSchema, submitBodySchema } from '../contracts/review';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createSubmissionsRouter({ services }: { services: Services }): RouteTableRouter {
  const { review, reviewReader } = services;
  const detail = (id: string, userId: string) => reviewReader.detail(id, userId);
  return mountRoutes(Router(), [
    route({
      method: 'post', path: '/submissions', access: 'submission.create', body: submitBodySchema,
      handler: async ({ req, res, body }) => {
        const userId = signedInUserId(req);
        const { id } = await review.submit(userId, body);
        res.status(201).json({ submission: await detail(id, userId) });
      },
    }),
    route({
      method: 'get', path: '/submissions', access: 'signedIn', query: mySubmissionsQuerySchema,
      handler: async ({ req, res, query }) => {
        res.json({ submissions: await review.mine(signedInUserId(req), query.checkRunId) });
      },
    }),
    route({
      method: 'get', path: '/submissions/:submissionId', access: 'submission.read', params: submissionParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ submission: await detail(params.submissionId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/submissions/:submissionId/actions', access: 'submission.act', params: submissionParamsSchema, body: actionBodySchema,
      handler: async ({ req, res, params, body }) => {
        const userId = signedInUserId(req);
        await review.act(params.submissionId, userId, body);
        res.json({ submission: await detail(params.submissionId, userId) });
      },
    }),
    route({
      method: 'post', path: '/submissions/:submissionId/resubmit', access: 'submission.resubmit', params: submissionParamsSchema, body: resubmitBodySchema,
      handler: async ({ req, res, params, body }) => {
        const userId = signedInUserId(req);
        const { id } = await review.resubmit(params.submissionId, userId, body);
        res.status(201).json({ submission: await detail(id, userId) });
      },
    }),
    route({
      method: 'post', path: '/submissions/:submissionId/annotations', access: 'submission.annotate', params: submissionParamsSchema, body: annotationBodySchema,
      handler: async ({ req, res, params, body }) => {
        const userId = signedInUserId(req);
        await review.annotate(params.submissionId, userId, body);
        res.status(201).json({ submission: await detail(params.submissionId, userId) });
      },
    }),
    route({
      method: 'get', path: '/submissions/:submissionId/report.pdf', access: 'submission.read', params: submissionParamsSchema, query: reportQuerySchema,
      handler: async ({ req, res, params, query }) => {
        const { pdf, recordNumber } = await reviewReader.approvedPdf(params.submissionId, signedInUserId(req), query.units);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', `inline; filename="cagewright-cage-record-${recordNumber}.pdf"`);
        res.setHeader('Cache-Control', 'private, no-cache');
        res.end(pdf);
      },
    }),
  ]);
}
