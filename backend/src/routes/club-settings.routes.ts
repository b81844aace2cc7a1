// A club's settings (docs/api.md, "Clubs and members"): every member reads the time zone and the
// club's date today; admins change the zone.
import { Router } from 'express';
import { clubParamsSchema, clubSettingsBodySchema } from '../contracts/clubs';
import { requireClubRole, signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route } from './route-table';

export function createClubSettingsRouter({ services }: { services: Services }): Router {
  const { clubSettings } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/clubs/:clubId/settings', guards: [requireClubRole(['builder', 'steward', 'admin'])], params: clubParamsSchema,
      handler: async ({ res, params }) => {
        res.json({ settings: await clubSettings.calendar(params.clubId) });
      },
    }),
    route({
      method: 'patch', path: '/clubs/:clubId/settings', guards: [requireClubRole(['admin'])], params: clubParamsSchema, body: clubSettingsBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ settings: await clubSettings.update(params.clubId, signedInUserId(req), body) });
      },
    }),
  ]);
}
