// Tube stock lists and the tube chooser (docs/api.md, "Tube stock and the tube chooser"). A club's
// list: every member reads it, its admins change it (audited). A builder's own sizes: theirs alone.
// The chooser reads a build sheet, so it answers whoever may read that sheet.
import { Router } from 'express';
import { clubParamsSchema } from '../contracts/clubs';
import { sheetParamsSchema } from '../contracts/garage';
import { ownStockTubeParamsSchema, stockTubeBodySchema, stockTubeParamsSchema, stockTubePatchSchema, tubeChoiceApplySchema, tubeChoiceQuerySchema } from '../contracts/tube-stock';
import { signedInUserId } from '../middleware/guards';
import type { ClubRole } from '../entities';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';


export function createTubeStockRouter({ services }: { services: Services }): RouteTableRouter {
  const { tubeStock, tubeChoice } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/clubs/:clubId/tube-stock', access: 'club.member', params: clubParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await tubeStock.listClub(params.clubId, signedInUserId(req), (res.locals.clubRoles ?? []) as ClubRole[]));
      },
    }),
    route({
      method: 'post', path: '/clubs/:clubId/tube-stock', access: 'club.admin', params: clubParamsSchema, body: stockTubeBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json({ tube: await tubeStock.addClub(params.clubId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'post', path: '/clubs/:clubId/tube-stock/common', access: 'club.admin', params: clubParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await tubeStock.addCommonSizes(params.clubId, signedInUserId(req)));
      },
    }),
    route({
      method: 'patch', path: '/clubs/:clubId/tube-stock/:tubeId', access: 'club.admin', params: stockTubeParamsSchema, body: stockTubePatchSchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ tube: await tubeStock.updateClub(params.clubId, params.tubeId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'delete', path: '/clubs/:clubId/tube-stock/:tubeId', access: 'club.admin', params: stockTubeParamsSchema,
      handler: async ({ req, res, params }) => {
        await tubeStock.removeClub(params.clubId, params.tubeId, signedInUserId(req));
        res.status(204).end();
      },
    }),
    route({
      method: 'get', path: '/tube-stock/mine', access: 'signedIn',
      handler: async ({ req, res }) => {
        res.json(await tubeStock.listMine(signedInUserId(req)));
      },
    }),
    route({
      method: 'post', path: '/tube-stock/mine', access: 'self.builder', body: stockTubeBodySchema,
      handler: async ({ req, res, body }) => {
        res.status(201).json({ tube: await tubeStock.addMine(signedInUserId(req), body) });
      },
    }),
    route({
      method: 'patch', path: '/tube-stock/mine/:tubeId', access: 'self.builder', params: ownStockTubeParamsSchema, body: stockTubePatchSchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ tube: await tubeStock.updateMine(signedInUserId(req), params.tubeId, body) });
      },
    }),
    route({
      method: 'delete', path: '/tube-stock/mine/:tubeId', access: 'signedIn', params: ownStockTubeParamsSchema,
      handler: async ({ req, res, params }) => {
        await tubeStock.removeMine(signedInUserId(req), params.tubeId);
        res.status(204).end();
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/tube-choice', access: 'sheet.read', params: sheetParamsSchema, query: tubeChoiceQuerySchema,
      handler: async ({ req, res, params, query }) => {
        res.json(await tubeChoice.choose(params.sheetId, signedInUserId(req), { anyMaterial: query.anyMaterial }));
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/tube-choice/apply', access: 'sheet.edit', params: sheetParamsSchema, body: tubeChoiceApplySchema,
      handler: async ({ req, res, params, body }) => {
        res.json(await tubeChoice.apply(params.sheetId, signedInUserId(req), body));
      },
    }),
  ]);
}
