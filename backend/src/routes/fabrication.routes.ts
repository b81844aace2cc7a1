// Fabrication sheets (docs/api.md, "Fabrication"): the cope and its 1:1 template PDF, the hoop leg
// trim. Signed in; no build sheet needed.
import { Router } from 'express';
import { copeBodySchema, copePdfBodySchema, legTrimBodySchema, unitsSchema } from '../contracts/fabrication';
import { requireSignedIn } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route } from './route-table';
import { z } from 'zod';

const unitsQuery = z.object({ units: unitsSchema.default('metric') });

export function createFabricationRouter({ services }: { services: Services }): Router {
  const { fabrication } = services;
  return mountRoutes(Router(), [
    route({
      method: 'post', path: '/fabrication/cope', guards: [requireSignedIn], body: copeBodySchema,
      handler: ({ res, body }) => {
        res.json({ cope: fabrication.cope(body) });
      },
    }),
    route({
      method: 'post', path: '/fabrication/cope.pdf', guards: [requireSignedIn], body: copePdfBodySchema,
      handler: async ({ res, body }) => {
        const pdf = await fabrication.copePdf(body);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', 'inline; filename="cagewright-cope-template.pdf"');
        res.setHeader('Cache-Control', 'private, no-cache');
        res.end(pdf);
      },
    }),
    route({
      method: 'post', path: '/fabrication/leg-trim', guards: [requireSignedIn], body: legTrimBodySchema, query: unitsQuery,
      handler: ({ res, body, query }) => {
        res.json({ legTrim: fabrication.legTrim(body, query.units) });
      },
    }),
  ]);
}
