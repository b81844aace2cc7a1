// A club's members, for that club's admins (docs/api.md, "Clubs and members").
import { Router } from 'express';
import { addMemberBodySchema, clubParamsSchema, memberParamsSchema, updateMemberBodySchema } from '../contracts/clubs';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';


export function createMembersRouter({ services }: { services: Services }): RouteTableRouter {
  const { members } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/clubs/:clubId/members',
      access: 'club.admin',
      params: clubParamsSchema,
      handler: async ({ res, params }) => {
        res.json({ members: await members.list(params.clubId) });
      },
    }),
    route({
      method: 'post',
      path: '/clubs/:clubId/members',
      access: 'club.admin',
      params: clubParamsSchema,
      body: addMemberBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json(await members.add(params.clubId, signedInUserId(req), body));
      },
    }),
    route({
      method: 'patch',
      path: '/clubs/:clubId/members/:userId',
      access: 'club.admin',
      params: memberParamsSchema,
      body: updateMemberBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ member: await members.updateRoles(params.clubId, params.userId, body.roles, signedInUserId(req)) });
      },
    }),
    route({
      method: 'delete',
      path: '/clubs/:clubId/members/:userId',
      access: 'club.admin',
      params: memberParamsSchema,
      handler: async ({ req, res, params }) => {
        await members.remove(params.clubId, params.userId, signedInUserId(req));
        res.status(204).end();
      },
    }),
  ]);
}
