// Cage records and the club's record settings (docs/api.md, "Review and cage records"). A record is
// read by the car's owner and the club's stewards and admins, revoked by a steward or admin; the
// settings (number prefix, validity in months) are read by stewards and admins, changed by admins.
// The club's records page lists them for its stewards and admins; a record's track inspections are
// read like the record and recorded by the club's stewards and admins (never on their own car).
import { Router } from 'express';
import { inspectionBodySchema, recordListQuerySchema } from '../contracts/cage-records';
import { clubParamsSchema, recordParamsSchema, recordSettingsBodySchema, revokeBodySchema } from '../contracts/review';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createCageRecordsRouter({ services }: { services: Services }): RouteTableRouter {
  const { cageRecords, recordBook } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/clubs/:clubId/cage-records', access: 'club.reviewer', params: clubParamsSchema, query: recordListQuerySchema,
      handler: async ({ res, params, query }) => {
        res.json(await recordBook.list(params.clubId, query));
      },
    }),
    route({
      method: 'get', path: '/cage-records/:recordId/inspections', access: 'record.read', params: recordParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await recordBook.inspections(params.recordId, signedInUserId(req)));
      },
    }),
    route({
      method: 'post', path: '/cage-records/:recordId/inspections', access: 'record.inspect', params: recordParamsSchema, body: inspectionBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json(await recordBook.recordInspection(params.recordId, signedInUserId(req), body));
      },
    }),
    route({
      method: 'get', path: '/cage-records/:recordId', access: 'record.read', params: recordParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ record: await cageRecords.get(params.recordId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/cage-records/:recordId/revoke', access: 'record.revoke', params: recordParamsSchema, body: revokeBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ record: await cageRecords.revoke(params.recordId, signedInUserId(req), body.reason) });
      },
    }),
    route({
      method: 'get', path: '/clubs/:clubId/record-settings', access: 'club.reviewer', params: clubParamsSchema,
      handler: async ({ res, params }) => {
        res.json({ settings: await cageRecords.settings(params.clubId) });
      },
    }),
    route({
      method: 'patch', path: '/clubs/:clubId/record-settings', access: 'club.admin', params: clubParamsSchema, body: recordSettingsBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ settings: await cageRecords.updateSettings(params.clubId, signedInUserId(req), body) });
      },
    }),
  ]);
}
