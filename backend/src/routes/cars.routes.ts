// The builder's cars and the build sheets started on them (docs/api.md, "Garage"). A car is only
// ever visible to its owner: anyone else gets 404, never 403.
import { Router } from 'express';
import { carParamsSchema, createCarBodySchema, createSheetBodySchema, listQuerySchema, updateCarBodySchema } from '../contracts/garage';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createCarsRouter({ services }: { services: Services }): RouteTableRouter {
  const { garage, buildSheets } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/cars', access: 'signedIn', query: listQuerySchema,
      handler: async ({ req, res, query }) => {
        res.json({ cars: await garage.list(signedInUserId(req), query) });
      },
    }),
    route({
      method: 'post', path: '/cars', access: 'signedIn', body: createCarBodySchema,
      handler: async ({ req, res, body }) => {
        res.status(201).json({ car: await garage.create(signedInUserId(req), body) });
      },
    }),
    route({
      method: 'get', path: '/cars/:carId', access: 'car.owner', params: carParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ car: await garage.get(params.carId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'patch', path: '/cars/:carId', access: 'car.owner', params: carParamsSchema, body: updateCarBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ car: await garage.update(params.carId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'post', path: '/cars/:carId/archive', access: 'car.owner', params: carParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ car: await garage.setArchived(params.carId, signedInUserId(req), true) });
      },
    }),
    route({
      method: 'post', path: '/cars/:carId/unarchive', access: 'car.owner', params: carParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ car: await garage.setArchived(params.carId, signedInUserId(req), false) });
      },
    }),
    route({
      method: 'delete', path: '/cars/:carId', access: 'car.owner', params: carParamsSchema,
      handler: async ({ req, res, params }) => {
        await garage.remove(params.carId, signedInUserId(req));
        res.status(204).end();
      },
    }),
    route({
      method: 'post', path: '/cars/:carId/build-sheets', access: 'car.addSheet', params: carParamsSchema, body: createSheetBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json(await buildSheets.create(params.carId, signedInUserId(req), body));
      },
    }),
  ]);
}
