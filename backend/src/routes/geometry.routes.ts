// POST /api/geometry/derive: the cage model's derived values (docs/api.md, "Cage geometry").
import { Router } from 'express';
import { deriveBodySchema } from '../contracts/geometry';
import { requireSignedIn } from '../middleware/guards';
import { deriveGeometry } from '../services/geometry.service';
import { mountRoutes, route } from './route-table';

export function createGeometryRouter(): Router {
  return mountRoutes(Router(), [
    route({
      method: 'post',
      path: '/geometry/derive',
      guards: [requireSignedIn],
      body: deriveBodySchema,
      handler: ({ res, body }) => {
        res.json({ geometry: deriveGeometry(body.specification) });
      },
    }),
  ]);
}
