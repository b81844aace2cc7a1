// Build sheets, their revisions and the diff between two of them, and the editions of the sheet's
// rulebook with the move to a newer one (docs/api.md, "Garage"). The owner edits; the club's stewards
// and admins read (403 when they try to edit); anyone else gets 404.
import { Router } from 'express';
import { sideBySideBodySchema } from '../contracts/side-by-side';
import { diffParamsSchema, moveEditionBodySchema, restoreRevisionBodySchema, revisionParamsSchema, saveRevisionBodySchema, sheetParamsSchema, updateSheetBodySchema } from '../contracts/garage';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createBuildSheetsRouter({ services }: { services: Services }): RouteTableRouter {
  const { buildSheets, sheetEditions, sideBySide } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/build-sheets/:sheetId', access: 'sheet.read', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await buildSheets.get(params.sheetId, signedInUserId(req)));
      },
    }),
    route({
      method: 'patch', path: '/build-sheets/:sheetId', access: 'sheet.edit', params: sheetParamsSchema, body: updateSheetBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json(await buildSheets.rename(params.sheetId, signedInUserId(req), body.name));
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/archive', access: 'sheet.edit', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await buildSheets.setArchived(params.sheetId, signedInUserId(req), true));
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/unarchive', access: 'sheet.edit', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await buildSheets.setArchived(params.sheetId, signedInUserId(req), false));
      },
    }),
    route({
      method: 'put', path: '/build-sheets/:sheetId/specification', access: 'sheet.edit', params: sheetParamsSchema, body: saveRevisionBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json(await buildSheets.saveRevision(params.sheetId, signedInUserId(req), body));
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/editions', access: 'sheet.read', params: sheetParamsSchema,
      summary: 'The sheet’s edition and the newest of its rulebook, with what the sheet gets under each.',
      handler: async ({ req, res, params }) => {
        res.json({ editions: await sheetEditions.editions(params.sheetId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/move-edition', access: 'sheet.edit', params: sheetParamsSchema, body: moveEditionBodySchema,
      summary: 'Moves the sheet to a newer edition of its rulebook as a new revision.',
      handler: async ({ req, res, params, body }) => {
        res.json(await sheetEditions.move(params.sheetId, signedInUserId(req), body));
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/side-by-side', access: 'sheet.edit', params: sheetParamsSchema,
      summary: 'The sheet’s own rulebook and every other edition in force in the builder’s clubs, with a class suggested for each.',
      handler: async ({ req, res, params }) => {
        res.json(await sideBySide.options(params.sheetId, signedInUserId(req)));
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/side-by-side', access: 'sheet.edit', params: sheetParamsSchema, body: sideBySideBodySchema,
      summary: 'The sheet’s latest revision checked against its own rulebook and the ones picked: rule areas × rulebooks, strictest marked.',
      handler: async ({ req, res, params, body }) => {
        res.json(await sideBySide.compare(params.sheetId, signedInUserId(req), body));
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/revisions', access: 'sheet.read', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ revisions: await buildSheets.revisions(params.sheetId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/revisions/:number', access: 'sheet.read', params: revisionParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ revision: await buildSheets.revision(params.sheetId, signedInUserId(req), params.number) });
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/revisions/:number/restore', access: 'sheet.edit', params: revisionParamsSchema, body: restoreRevisionBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json(await buildSheets.restoreRevision(params.sheetId, signedInUserId(req), params.number, body.baseRevision));
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/revisions/:from/diff/:to', access: 'sheet.read', params: diffParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await buildSheets.diff(params.sheetId, signedInUserId(req), params.from, params.to));
      },
    }),
  ]);
}
