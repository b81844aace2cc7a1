// A club's rulebooks and one ruleset version with its document (docs/api.md, "Rulesets and checks").
import { Router } from 'express';
import { clubParamsSchema } from '../contracts/clubs';
import { rulesetVersionParamsSchema } from '../contracts/checks';
import { allows } from '../domain/access-policy';
import type { ClubRole } from '../entities';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';


export function createRulebooksRouter({ services }: { services: Services }): RouteTableRouter {
  const { rulesets } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/clubs/:clubId/rulebooks',
      access: 'club.member',
      params: clubParamsSchema,
      handler: async ({ req, res, params }) => {
        // Drafts are listed for those who may see a draft.
        const includeDrafts = allows('version.read', { actorId: signedInUserId(req), roles: res.locals.clubRoles as ClubRole[], draft: true });
        res.json({ rulebooks: await rulesets.listRulebooks(params.clubId, { includeDrafts }) });
      },
    }),
    route({
      method: 'get',
      path: '/ruleset-versions/:versionId',
      // Membership of the owning club is checked by the service: a stranger gets 404, as for an unknown id.
      access: 'version.read',
      params: rulesetVersionParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ version: await rulesets.getVersion(params.versionId, signedInUserId(req)) });
      },
    }),
  ]);
}
