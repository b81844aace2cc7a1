// Route tables: each route reads as method + path + access rule + validation + handler. The access rule
// (domain/access-policy.ts) is required: it makes the route's guard, and it is what the access matrix
// test and the OpenAPI document read. Params/body/query are parsed with zod before the handler runs, and
// the handler receives the parsed values. Handlers stay thin and call one service method.
import type { Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import type { AccessRuleName } from '../domain/access-policy';
import { ValidationError, type AppError } from '../errors';
import { guardFor } from '../middleware/guards';
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
  /** Who may call it: a rule of the one access policy. The guard comes from it; services decide the rest by the same rule. */
  access: AccessRuleName;
  /** One line for the OpenAPI document. */
  summary?: string;
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
  access: AccessRuleName;
  summary?: string;
  /** The zod schemas of its input, for the OpenAPI document. */
  schemas: { params?: z.ZodType; body?: z.ZodType; query?: z.ZodType };
  mount(router: Router): void;
}

/** A router made by mountRoutes, with the routes it holds (app.ts collects them for /api/openapi.json). */
export type RouteTableRouter = Router & { routes: readonly Route[] };

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
  const described: Route = {
    method: spec.method,
    path: spec.path,
    access: spec.access,
    ...(spec.summary ? { summary: spec.summary } : {}),
    schemas: { ...(spec.params ? { params: spec.params } : {}), ...(spec.body ? { body: spec.body } : {}), ...(spec.query ? { query: spec.query } : {}) },
    mount(router) {
      // The last handler carries the route's description, so whoever walks Express's own router (the
      // access matrix test) finds which rule a mounted path answers to, and a path mounted some other
      // way stands out.
      router[spec.method](spec.path, guardFor(spec.access), ...(spec.before ?? []), Object.assign(run, { routeSpec: described }));
    },
  };
  return described;
}

/** File names by form field, as `{ photos: [{ name }] }`, for the text check. */
function groupNames(files: { fieldname: string; originalname: string }[]): Record<string, { name: string }[]> {
  const out: Record<string, { name: string }[]> = {};
  for (const f of files) (out[f.fieldname] ??= []).push({ name: f.originalname });
  return out;
}

export function mountRoutes(router: Router, routes: Route[]): RouteTableRouter {
  for (const r of routes) r.mount(router);
  return Object.assign(router, { routes });
}
