// GET /api/openapi.json (issue 12, §9): generated from the route tables and their zod schemas. Every route
// the app mounts (read from Express's own router, the mailbox's too) is in it with its access rule, and
// nothing else is; its input schemas are the contracts' own; the document is valid OpenAPI 3.1.
import { Validator } from '@seriousme/openapi-schema-validator';
import type { Express } from 'express';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { openApiPath } from '../../backend/src/routes/openapi';
import { makeTestApp, testConfig, useTestDatabase } from './helpers';
import { mountedRoutes, routeKey } from './support/mounted-routes';

const db = useTestDatabase();
let app: Express;
type Operation = {
  'x-access': string;
  security: unknown[];
  parameters?: { name: string; in: string; required: boolean; schema: Record<string, unknown> }[];
  requestBody?: { content: { 'application/json': { schema: { properties?: Record<string, unknown>; required?: string[] } } } };
  responses: Record<string, unknown>;
};
let doc: { openapi: string; paths: Record<string, Record<string, Operation>> };

beforeAll(async () => {
  app = makeTestApp(db.ds, { config: testConfig({ FAKE_SMTP: 'true' }) });
  const res = await request(app).get('/api/openapi.json').expect(200).expect('Content-Type', /application\/json/);
  doc = res.body;
});

describe('GET /api/openapi.json', () => {
  it('is open to anyone and valid OpenAPI 3.1', async () => {
    expect(doc.openapi).toBe('3.1.0');
    const result = await new Validator().validate(structuredClone(doc));
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
  });

  it('has every mounted route, with its access rule, and nothing that is not mounted', () => {
    const mounted = mountedRoutes(app);
    expect(mounted.length).toBeGreaterThan(90);
    const missing = mounted.filter((r) => !doc.paths[openApiPath(r.path.replace(/^\/api/, ''))]?.[r.method]).map(routeKey);
    expect(missing).toEqual([]);
    for (const r of mounted) {
      expect([routeKey(r), doc.paths[openApiPath(r.path.replace(/^\/api/, ''))]![r.method]!['x-access']]).toEqual([routeKey(r), r.spec!.access]);
    }
    const documented = Object.entries(doc.paths).flatMap(([p, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${p.replace(/\{(\w+)\}/g, ':$1')}`));
    expect(documented.sort()).toEqual(mounted.map(routeKey).sort());
  });

  it('describes input with the contracts’ schemas and refusals with the policy’s answers', () => {
    const createSheet = doc.paths['/api/cars/{carId}/build-sheets']!.post!;
    expect(createSheet.requestBody!.content['application/json'].schema.required).toEqual(expect.arrayContaining(['name', 'clubId', 'rulesetVersionId', 'classId']));
    expect(createSheet.parameters).toEqual([expect.objectContaining({ name: 'carId', in: 'path', required: true, schema: expect.objectContaining({ format: 'uuid' }) })]);
    // A revision number is a whole number of at least 1 in the contract; the document says so.
    const revision = doc.paths['/api/build-sheets/{sheetId}/revisions/{number}']!.get!;
    expect(revision.parameters!.find((p) => p.name === 'number')!.schema).toMatchObject({ type: 'integer', minimum: 1 });
    // Query strings come from the query schemas.
    const queue = doc.paths['/api/clubs/{clubId}/submissions']!.get!;
    expect(queue.parameters!.filter((p) => p.in === 'query').map((p) => p.name)).toEqual(expect.arrayContaining(['state', 'sort']));
    // sheet.edit refuses the club's reviewers with 403 and everyone else with 404; public routes need no session.
    expect(Object.keys(doc.paths['/api/build-sheets/{sheetId}']!.patch!.responses)).toEqual(expect.arrayContaining(['400', '401', '403', '404']));
    expect(Object.keys(doc.paths['/api/build-sheets/{sheetId}']!.get!.responses)).not.toContain('403');
    expect(doc.paths['/api/verify/{code}']!.get!.security).toEqual([]);
    expect(doc.paths['/api/auth/me']!.get!.security).toEqual([{ session: [] }]);
  });
});
