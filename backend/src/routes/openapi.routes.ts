// GET /api/openapi.json: the OpenAPI document of every route this app mounted (routes/openapi.ts), made
// once on first request from the route tables app.ts collected.
import { Router } from 'express';
import { buildOpenApiDocument, type OpenApiDocument } from './openapi';
import { mountRoutes, route, type Route, type RouteTableRouter } from './route-table';

export function createOpenApiRouter({ routes, version }: { routes: () => readonly Route[]; version: string }): RouteTableRouter {
  let doc: OpenApiDocument | undefined;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/openapi.json',
      access: 'public',
      summary: 'This document',
      handler: ({ res }) => {
        doc ??= buildOpenApiDocument(routes(), { version });
        // Public and the same for everyone until the next release.
        res.setHeader('Cache-Control', 'public, max-age=300');
        res.json(doc);
      },
    }),
  ]);
}
