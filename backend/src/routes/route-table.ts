// Route tables: each route reads as method + path + guards + validation + handler. Guards are
// required (at least one), params/body/query are parsed with zod before the handler runs, and the
// handler receives the parsed values. Handlers stay thin and call one service method.
import type { Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import { ValidationError, type AppError } from '../errors';
import type { Guard } from '../middleware/guards';
import { assertSafeInput, unsafeInputIssues } from '../middleware/safe-input';
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
  /** The answer to a route parameter with a NUL or a lone surrogate; default `400 validation_failed` at `params.<name>`. */
  unsafeParams?: () => AppError;
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
    // The boundary's text check (middleware/safe-input.ts) for what only exists here: route parameters,
    // and multipart fields (the upload middleware in `before` fills req.body after the app-wide check).
    const paramIssues = unsafeInputIssues(req.params, 'params');
    if (paramIssues.length > 0) throw spec.unsafeParams ? spec.unsafeParams() : new ValidationError(paramIssues);
    assertSafeInput(req.body);
    // Uploaded files' names are text the client chose, too (`photos.0.name`).
    const files = Array.isArray(req.files) ? req.files : [];
    if (files.length > 0) assertSafeInput(Object.fromEntries(Object.entries(groupNames(files))), '');
    const params = spec.params ? parseOrThrow(spec.params, req.params, 'params') : (req.params as P);
    // Body fields keep their plain paths (`email`, `members.0.wallMm`), as docs/api.md shows.
    const body = spec.body ? parseOrThrow(spec.body, req.body ?? {}) : (undefined as B);
    // What a contract unpacks from a field (an imported file's JSON text) is checked like what arrived.
    if (spec.body) assertSafeInput(body);
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

/** File names by form field, as `{ photos: [{ name }] }`, for the text check. */
function groupNames(files: { fieldname: string; originalname: string }[]): Record<string, { name: string }[]> {
  const out: Record<string, { name: string }[]> = {};
  for (const f of files) (out[f.fieldname] ??= []).push({ name: f.originalname });
  return out;
}

export function mountRoutes(router: Router, routes: Route[]): Router {
  for (const r of routes) r.mount(router);
  return router;
}
