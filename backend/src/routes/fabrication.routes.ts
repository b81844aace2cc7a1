// Fabrication sheets (docs/api.md, "Fabrication"): the cope and its 1:1 template PDF, the hoop leg
// trim, the bend schedule and settings (signed in; no build sheet needed), and a sheet's fabrication,
// buying list and hoops' measured legs (as the sheet allows).
import { Router } from 'express';
import { bendScheduleBodySchema, copeBodySchema, copePdfBodySchema, fabricationSettingsSchema, hoopLegsBodySchema, hoopLegsParamsSchema, legTrimBodySchema, unitsSchema } from '../contracts/fabrication';
import { sheetParamsSchema } from '../contracts/garage';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';
import { z } from 'zod';

const unitsQuery = z.object({ units: unitsSchema.default('metric') });

export function createFabricationRouter({ services }: { services: Services }): RouteTableRouter {
  const { fabrication } = services;
  return mountRoutes(Router(), [
    route({
      method: 'post', path: '/fabrication/cope', access: 'signedIn', body: copeBodySchema,
      handler: ({ res, body }) => {
        res.json({ cope: fabrication.cope(body) });
      },
    }),
    route({
      method: 'post', path: '/fabrication/cope.pdf', access: 'signedIn', body: copePdfBodySchema,
      handler: async ({ res, body }) => {
        const pdf = await fabrication.copePdf(body);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', 'inline; filename="cagewright-cope-template.pdf"');
        res.setHeader('Cache-Control', 'private, no-cache');
        res.end(pdf);
      },
    }),
    route({
      method: 'post', path: '/fabrication/leg-trim', access: 'signedIn', body: legTrimBodySchema, query: unitsQuery,
      handler: ({ res, body, query }) => {
        res.json({ legTrim: fabrication.legTrim(body, query.units) });
      },
    }),
    route({
      method: 'post', path: '/fabrication/bend-schedule', access: 'signedIn', body: bendScheduleBodySchema,
      handler: async ({ req, res, body }) => {
        res.json({ plan: await fabrication.bendSchedule(body, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get', path: '/fabrication/settings', access: 'signedIn',
      handler: async ({ req, res }) => {
        res.json({ settings: await fabrication.settings(signedInUserId(req)) });
      },
    }),
    route({
      method: 'put', path: '/fabrication/settings', access: 'signedIn', body: fabricationSettingsSchema,
      handler: async ({ req, res, body }) => {
        res.json({ settings: await fabrication.saveSettings(signedInUserId(req), body) });
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/fabrication', access: 'sheet.read', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ fabrication: await fabrication.forSheet(params.sheetId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'put', path: '/build-sheets/:sheetId/fabrication/legs/:memberId', access: 'sheet.edit', params: hoopLegsParamsSchema, body: hoopLegsBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ measuredLegs: await fabrication.saveMeasuredLegs(params.sheetId, params.memberId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'delete', path: '/build-sheets/:sheetId/fabrication/legs/:memberId', access: 'sheet.edit', params: hoopLegsParamsSchema,
      handler: async ({ req, res, params }) => {
        await fabrication.clearMeasuredLegs(params.sheetId, params.memberId, signedInUserId(req));
        res.status(204).end();
      },
    }),
    route({
      method: 'get', path: '/build-sheets/:sheetId/buying-list.csv', access: 'sheet.read', params: sheetParamsSchema, query: unitsQuery,
      handler: async ({ req, res, params, query }) => {
        const { csv, sheetName } = await fabrication.buyingListCsv(params.sheetId, signedInUserId(req), query.units);
        const safeName = sheetName.replace(/[^A-Za-z0-9_-]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'sheet';
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="cagewright-buying-list-${safeName}.csv"`);
        res.setHeader('Cache-Control', 'private, no-cache');
        res.end(csv);
      },
    }),
  ]);
}
