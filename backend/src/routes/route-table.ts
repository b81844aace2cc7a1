// Route tables: each route reads as method + path + guards + validation + handler. Guards are
// required (at least one), params/body/query are parsed with zod before the handler runs, and the
// handler receives the parsed values. Handlers stay thin and call one service method.
import type { Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import type { Guard } from '../middleware/guards';
import { parseOrThrow } from '../middleware/validate';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface RouteInput<P, B, Q> {
  req: Request;
  res: Response;
  params: P;
  body: B;
  query: Q;
}

export interface RouteSpec<P, B, Q> {
  method: Method;
  path: string;
  guards: [Guard, ...Guard[]];
  /** Extra middleware after the guards, before validation (rate limits, say). */
  before?: RequestHandler[];
  params?: z.ZodType<P>;
  body?: z.ZodType<B>;
  query?: z.ZodType<Q>;
  handler: (input: RouteInput<P, B, Q>) => Promise<void> | void;
}

export interface Route {
  method: Method;
  path: string;
  guardNames: string[];
  mount(router: Router): void;
}

export function route<P = Record<string, string>, B = undefined, Q = undefined>(spec: RouteSpec<P, B, Q>): Route {
  const run: RequestHandler = async (req, res) => {
    const params = spec.params ? parseOrThrow(spec.params, req.params, 'params') : (req.params as P);
    // Body fields keep their plain paths (`email`, `members.0.wallMm`), as docs/api.md shows.
    const body = spec.body ? parseOrThrow(spec.body, req.body ?? {}) : (undefined as B);
    const query = spec.query ? parseOrThrow(spec.query, req.query, 'query') : (undefined as Q);
    await spec.handler({ req, res, params, body, query });
  };
  return {
    method: spec.method,
    path: spec.path,
    guardNames: spec.guards.map((g) => g.guardName),
    mount(router) {
      router[spec.method](spec.path, ...spec.guards, ...(spec.before ?? []), run);
    },
  };
}

export function mountRoutes(router: Router, routes: Route[]): Router {
  for (const r of routes) r.mount(router);
  return router;
}
