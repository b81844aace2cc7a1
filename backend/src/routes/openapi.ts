// The OpenAPI 3.1 document of the API, made from the route tables the app mounted: each route's method,
// path, access rule and the zod schemas its input is parsed with (zod 4's own JSON Schema output, for
// the input side: what a client sends, before defaults and transforms). Nothing here is written by hand
// per route, so the document cannot drift from what the server does; docs/api.md says it in words.
import { z } from 'zod';
import { accessRule, ACCESS_RULES, refusalsOf, type AccessRuleName } from '../domain/access-policy';
import { sessionCookieName } from '../middleware/session';
import type { Route } from './route-table';

type Json = Record<string, unknown>;

export interface OpenApiDocument {
  openapi: '3.1.0';
  info: { title: string; version: string; description: string };
  servers: { url: string }[];
  paths: Record<string, Record<string, Json>>;
  components: { schemas: Record<string, Json>; securitySchemes: Record<string, Json> };
}

/** `/build-sheets/:sheetId` → `/api/build-sheets/{sheetId}`. */
export function openApiPath(path: string): string {
  return `/api${path.replace(/:(\w+)/g, '{$1}')}`;
}

const pathParams = (path: string) => [...path.matchAll(/:(\w+)/g)].map((m) => m[1]!);

/**
 * A zod schema as JSON Schema for the document. Recursive parts come out as local `$defs`; they move
 * to components (named after the route) so that every `$ref` resolves from the document's root.
 */
function jsonSchema(schema: z.ZodType, name: string, components: Record<string, Json>): Json {
  const out = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Json;
  delete out.$schema;
  const defs = out.$defs as Record<string, Json> | undefined;
  if (!defs) return out;
  delete out.$defs;
  const rename = (ref: string) => ref.replace(/^#\/\$defs\//, `#/components/schemas/${name}.`);
  const rewrite = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(rewrite);
    if (v && typeof v === 'object') {
      return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, k === '$ref' && typeof x === 'string' ? rename(x) : rewrite(x)]));
    }
    return v;
  };
  for (const [k, d] of Object.entries(defs)) components[`${name}.${k}`] = rewrite(d) as Json;
  return rewrite(out) as Json;
}

function operationId(r: Route): string {
  const words = `${r.method} ${r.path}`.replace(/[:{}]/g, ' ').split(/[^A-Za-z0-9]+/).filter(Boolean);
  return words.map((w, i) => (i === 0 ? w.toLowerCase() : w[0]!.toUpperCase() + w.slice(1))).join('');
}

const errorResponse = (description: string) => ({ description, content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } });

const refusalWords: Record<401 | 403 | 404, string> = {
  401: 'Not signed in (`unauthenticated`).',
  403: 'Signed in, but the role does not allow this (`forbidden`).',
  404: 'Not found, or not the caller’s to see: the same answer either way (`not_found`).',
};

function operation(r: Route, components: Record<string, Json>): Json {
  const id = operationId(r);
  const parameters: Json[] = [];
  const paramsSchema = r.schemas.params ? jsonSchema(r.schemas.params, `${id}.params`, components) : null;
  const paramProps = (paramsSchema?.properties ?? {}) as Record<string, Json>;
  for (const name of pathParams(r.path)) parameters.push({ name, in: 'path', required: true, schema: paramProps[name] ?? { type: 'string' } });
  if (r.schemas.query) {
    const q = jsonSchema(r.schemas.query, `${id}.query`, components);
    const required = new Set((q.required as string[] | undefined) ?? []);
    for (const [name, schema] of Object.entries((q.properties ?? {}) as Record<string, Json>)) {
      parameters.push({ name, in: 'query', required: required.has(name), schema });
    }
  }
  const rule = accessRule(r.access);
  const responses: Record<string, Json> = { '2XX': { description: 'Done; the body is described in docs/api.md.' } };
  if (r.schemas.body || r.schemas.params || r.schemas.query) responses['400'] = errorResponse('Invalid input: `validation_failed`, with every field and its path in `details`.');
  for (const status of refusalsOf(r.access)) responses[String(status)] = errorResponse(refusalWords[status]);
  if (pathParams(r.path).length > 0) responses['404'] ??= errorResponse('Nothing of this id (`not_found`).');
  responses.default = errorResponse('Any other refusal or failure, in the one error shape.');
  return {
    operationId: id,
    summary: r.summary ?? `${r.method.toUpperCase()} ${openApiPath(r.path)}`,
    description: `Who may call it: ${rule.summary}`,
    'x-access': r.access,
    security: r.access === 'public' ? [] : [{ session: [] }],
    ...(parameters.length ? { parameters } : {}),
    ...(r.schemas.body ? { requestBody: { required: true, content: { 'application/json': { schema: jsonSchema(r.schemas.body, `${id}.body`, components) } } } } : {}),
    responses,
  };
}

export function buildOpenApiDocument(routes: readonly Route[], options: { version: string }): OpenApiDocument {
  const schemas: Record<string, Json> = {
    Error: {
      type: 'object',
      required: ['error'],
      properties: {
        error: {
          type: 'object',
          required: ['code', 'message', 'requestId'],
          properties: {
            code: { type: 'string', description: 'A stable code: validation_failed, unauthenticated, forbidden, not_found, conflict, …' },
            message: { type: 'string', description: 'Plain words for a person.' },
            details: { description: 'More about the error; for validation_failed a list of { path, message }.' },
            requestId: { type: 'string', description: 'The id of the request, as on every log line about it and in the X-Request-Id header.' },
          },
        },
      },
    },
  };
  const paths: OpenApiDocument['paths'] = {};
  for (const r of routes) (paths[openApiPath(r.path)] ??= {})[r.method] = operation(r, schemas);
  const rules = Object.keys(ACCESS_RULES) as AccessRuleName[];
  return {
    openapi: '3.1.0',
    info: {
      title: 'Cagewright API',
      version: options.version,
      description: [
        'Generated from the route tables and their zod schemas. Each operation names its access rule in `x-access`:',
        '',
        ...rules.map((n) => `- \`${n}\`: ${accessRule(n).summary}`),
        '',
        'Writes need the session cookie and the `X-CSRF-Token` header (GET /api/auth/csrf).',
      ].join('\n'),
    },
    servers: [{ url: '/' }],
    paths,
    components: {
      schemas,
      securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: sessionCookieName, description: 'The session cookie set at sign-in.' } },
    },
  };
}
