// Rulebook administration for club admins (docs/api.md, "Rulebook administration"). Every route
// needs the admin role in the club that owns the rulebook: strangers get 404, other roles 403.
// Creating a rulebook names the club in the path (its access rule checks the role there); the other
// routes name a version or rulebook, whose club the service checks through the access policy.
import { Router } from 'express';
import { clubParamsSchema } from '../contracts/clubs';
import {
  compareParamsSchema,
  createRulebookBodySchema,
  draftParamsSchema,
  importDraftBodySchema,
  publishBodySchema,
  rulebookParamsSchema,
  saveDraftBodySchema,
} from '../contracts/rulebook-admin';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import type { RepublishQueue } from '../services/rulebook-admin.service';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createRulebookAdminRouter({ services, republishQueue }: { services: Services; republishQueue: RepublishQueue | null }): RouteTableRouter {
  const admin = services.rulebookAdmin;
  return mountRoutes(Router(), [
    route({
      method: 'post',
      path: '/clubs/:clubId/rulebooks',
      access: 'club.admin',
      params: clubParamsSchema,
      body: createRulebookBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json({ version: await admin.createRulebook(params.clubId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'post',
      path: '/rulebooks/:rulebookId/drafts',
      access: 'rulebook.admin',
      params: rulebookParamsSchema,
      handler: async ({ req, res, params }) => {
        res.status(201).json({ version: await admin.createDraft(params.rulebookId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'put',
      path: '/ruleset-drafts/:versionId',
      access: 'version.admin',
      params: draftParamsSchema,
      body: saveDraftBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ draft: await admin.saveDraft(params.versionId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'post',
      path: '/ruleset-drafts/:versionId/import',
      access: 'version.admin',
      params: draftParamsSchema,
      body: importDraftBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ draft: await admin.importDraft(params.versionId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'delete',
      path: '/ruleset-drafts/:versionId',
      access: 'version.admin',
      params: draftParamsSchema,
      handler: async ({ req, res, params }) => {
        await admin.deleteDraft(params.versionId, signedInUserId(req));
        res.status(204).end();
      },
    }),
    route({
      // A background job (its progress and result: GET /api/jobs/:id), so 10,000 sheets never hold a request.
      method: 'post',
      path: '/ruleset-drafts/:versionId/impact',
      access: 'version.admin',
      params: draftParamsSchema,
      handler: async ({ req, res, params }) => {
        const userId = signedInUserId(req);
        const jobId = await admin.startImpact(params.versionId, userId, republishQueue);
        res.status(202).json({ job: await services.jobProgress.forAdmin(userId, jobId) });
      },
    }),
    route({
      method: 'post',
      path: '/ruleset-drafts/:versionId/publish',
      access: 'version.admin',
      params: draftParamsSchema,
      body: publishBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(202).json({ published: await admin.publish(params.versionId, signedInUserId(req), body, republishQueue) });
      },
    }),
    route({
      method: 'post',
      path: '/ruleset-versions/:versionId/retire',
      access: 'version.admin',
      params: draftParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ version: await admin.retire(params.versionId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get',
      path: '/ruleset-versions/:versionId/compare/:otherId',
      access: 'version.admin',
      params: compareParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await admin.compare(params.versionId, params.otherId, signedInUserId(req)));
      },
    }),
    route({
      method: 'get',
      path: '/ruleset-versions/:versionId/export',
      access: 'version.admin',
      params: draftParamsSchema,
      handler: async ({ req, res, params }) => {
        const file = await admin.exportVersion(params.versionId, signedInUserId(req));
        res.set('Content-Type', 'application/json; charset=utf-8');
        res.set('Content-Disposition', `attachment; filename="${file.fileName}"`);
        res.send(file.json);
      },
    }),
  ]);
}
