// A club's settings (docs/api.md, "Clubs and members"): every member reads the time zone and the
// club's date today; admins change the zone.
import { Router } from 'express';
import { clubParamsSchema, clubSettingsBodySchema } from '../contracts/clubs';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createClubSettingsRouter({ services }: { services: Services }): RouteTableRouter {
  const { clubSettings } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/clubs/:clubId/settings', access: 'club.member', params: clubParamsSchema,
      summary: 'The club’s time zone and its calendar date today.',
      handler: async ({ res, params }) => {
        res.json({ settings: await clubSettings.calendar(params.clubId) });
      },
    }),
    route({
      method: 'patch', path: '/clubs/:clubId/settings', access: 'club.admin', params: clubParamsSchema, body: clubSettingsBodySchema,
      summary: 'Changes the club’s time zone (logged).',
      handler: async ({ req, res, params, body }) => {
        res.json({ settings: await clubSettings.update(params.clubId, signedInUserId(req), body) });
      },
    }),
  ]);
}
