// POST /api/geometry/derive: the cage model's derived values (docs/api.md, "Cage geometry").
import { Router } from 'express';
import { deriveBodySchema } from '../contracts/geometry';
import { deriveGeometry } from '../services/geometry.service';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createGeometryRouter(): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'post',
      path: '/geometry/derive',
      access: 'signedIn',
      body: deriveBodySchema,
      handler: ({ res, body }) => {
        res.json({ geometry: deriveGeometry(body.specification) });
      },
    }),
  ]);
}
