// A club's rulebooks and one ruleset version with its document (docs/api.md, "Rulesets and checks").
import { Router } from 'express';
import { clubParamsSchema } from '../contracts/clubs';
import { rulesetVersionParamsSchema } from '../contracts/checks';
import type { ClubRole } from '../entities';
import { requireClubRole, requireSignedIn, signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route } from './route-table';

const anyMember = requireClubRole(['builder', 'steward', 'admin']);

export function createRulebooksRouter({ services }: { services: Services }): Router {
  const { rulesets } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/clubs/:clubId/rulebooks',
      guards: [anyMember],
      params: clubParamsSchema,
      handler: async ({ res, params }) => {
        const roles = res.locals.clubRoles as ClubRole[];
        res.json({ rulebooks: await rulesets.listRulebooks(params.clubId, { includeDrafts: roles.includes('admin') }) });
      },
    }),
    route({
      method: 'get',
      path: '/ruleset-versions/:versionId',
      // Membership of the owning club is checked by the service: a stranger gets 404, as for an unknown id.
      guards: [requireSignedIn],
      params: rulesetVersionParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ version: await rulesets.getVersion(params.versionId, signedInUserId(req)) });
      },
    }),
  ]);
}
