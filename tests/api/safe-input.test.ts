// The boundary's text check (middleware/safe-input.ts): a NUL or a lone UTF-16 surrogate anywhere a
// request carries text (JSON body, query string, route parameter, multipart field, a file name, the
// JSON text of an imported ruleset) is refused with 400 validation_failed at its path, before anything
// reaches PostgreSQL (which refuses NUL in text and jsonb, and lone surrogates in jsonb). Over-deep
// nesting and `__proto__` keys likewise. /api/verify/<anything> keeps its documented 404.
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { testJpeg } from './garage-fixtures';
import { type Agent, agentFor, demo, errorBody, makeTestApp, signIn, useTestDatabase } from './helpers';

const db = useTestDatabase();
let app: Express;
let builder: Agent;
let builderToken: string;
let admin: Agent;
let adminToken: string;
let carId: string;
let sheetId: string;
let draft: { id: string; lockVersion: number; document: Record<string, unknown> };

const NUL = 'Must not contain a NUL character (U+0000)';
const SURROGATE = 'Must not contain an unpaired UTF-16 surrogate';

beforeAll(async () => {
  app = makeTestApp(db.ds);
  builder = agentFor(app);
  builderToken = await signIn(builder, demo.builder);
  admin = agentFor(app);
  adminToken = await signIn(admin, demo.admin);
  const [v] = await db.ds.query(
    `SELECT v.id, v.rulebook_id, r.club_id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.slug = 'tarnwick-vale-mc-cage-regulations-2027' AND v.status = 'published'`,
  );
  carId = (await builder.post('/api/cars').set('X-CSRF-Token', builderToken).send({ name: 'Boundary car', chassisType: 'unibody' }).expect(201)).body.car.id;
  const sheet = await builder
    .post(`/api/cars/${carId}/build-sheets`)
    .set('X-CSRF-Token', builderToken)
    .send({ name: 'Boundary sheet', clubId: v.club_id, rulesetVersionId: v.id, classId: 'club-saloon' })
    .expect(201);
  sheetId = sheet.body.sheet?.id ?? sheet.body.buildSheet?.id ?? sheet.body.id;
  draft = (await admin.post(`/api/rulebooks/${v.rulebook_id}/drafts`).set('X-CSRF-Token', adminToken).expect(201)).body.version;
});

function refused(res: { status: number; body: { error?: { code?: string; details?: unknown } } }, details: { path: string; message: string }[]) {
  expect(res.status).toBe(400);
  expect(res.body.error?.code).toBe('validation_failed');
  expect(res.body.error?.details).toEqual(details);
}

describe('text a request carries', () => {
  it('refuses a NUL in a JSON field at its path, and saves nothing', async () => {
    const res = await builder.post('/api/cars').set('X-CSRF-Token', builderToken).send({ name: 'Night\u0000runner', chassisType: 'unibody' });
    refused(res, [{ path: 'name', message: NUL }]);
    const [{ n }] = await db.ds.query(`SELECT count(*)::int AS n FROM cars WHERE name LIKE 'Night%'`);
    expect(n).toBe(0);
  });

  it('refuses lone surrogates deep inside a draft document, each at its own path', async () => {
    const doc = structuredClone(draft.document) as { requirements: { title: string }[]; rulebook: { title: string } };
    doc.requirements[1]!.title = 'Main hoop \uD800';
    doc.rulebook.title = '\uDC00 rules';
    const res = await admin.put(`/api/ruleset-drafts/${draft.id}`).set('X-CSRF-Token', adminToken).send({ lockVersion: draft.lockVersion, document: doc });
    refused(res, [
      { path: 'document.rulebook.title', message: SURROGATE },
      { path: 'document.requirements.1.title', message: SURROGATE },
    ]);
  });

  it('accepts a well-formed surrogate pair (an emoji) as ordinary text', async () => {
    await builder.patch(`/api/cars/${carId}`).set('X-CSRF-Token', builderToken).send({ name: 'Blue 🚗' }).expect(200);
  });

  it('looks inside an imported ruleset’s JSON text', async () => {
    const doc = structuredClone(draft.document) as { rulebook: { publisher: string } };
    doc.rulebook.publisher = 'Tarnwick\u0000Vale';
    const res = await admin.post(`/api/ruleset-drafts/${draft.id}/import`).set('X-CSRF-Token', adminToken).send({ lockVersion: draft.lockVersion, text: JSON.stringify(doc) });
    refused(res, [{ path: 'text.rulebook.publisher', message: NUL }]);
  });

  it('refuses them in a query string and in route parameters', async () => {
    refused(await builder.get('/api/cars?show=%00'), [{ path: 'query.show', message: NUL }]);
    refused(await builder.get('/api/cars/%00'), [{ path: 'params.carId', message: NUL }]);
    refused(await builder.get(`/api/build-sheets/${sheetId}%00`), [{ path: 'params.sheetId', message: NUL }]);
  });

  it('refuses them in multipart fields and file names', async () => {
    const jpeg = await testJpeg(32, 24);
    const caption = await builder.post(`/api/build-sheets/${sheetId}/photos`).set('X-CSRF-Token', builderToken).attach('photos', jpeg, 'a.jpg').field('captions', 'left foot\u0000');
    refused(caption, [{ path: 'captions', message: NUL }]);
    // (A lone surrogate cannot even be sent in a file name: the form's UTF-8 encoding replaces it.)
    const name = await builder.post(`/api/build-sheets/${sheetId}/photos`).set('X-CSRF-Token', builderToken).attach('photos', jpeg, 'a\u0000.jpg');
    // (busboy may refuse the form itself first; either way a 400 at `photos…`.)
    expect(name.status).toBe(400);
    expect(name.body.error.code).toBe('validation_failed');
    expect(name.body.error.details[0].path).toMatch(/^photos/);
    const [{ n }] = await db.ds.query(`SELECT count(*)::int AS n FROM photos WHERE build_sheet_id = $1`, [sheetId]);
    expect(n).toBe(0);
  });

  it('refuses a __proto__ key and nesting deeper than 32 levels', async () => {
    refused(await builder.post('/api/cars').set('X-CSRF-Token', builderToken).type('json').send('{"name": "x", "chassisType": "unibody", "__proto__": {"admin": true}}'), [
      { path: '__proto__', message: 'Not allowed as a field name' },
    ]);
    const deep = await builder.post('/api/cars').set('X-CSRF-Token', builderToken).type('json').send('{"make":' + '['.repeat(40) + ']'.repeat(40) + '}');
    expect(deep.status).toBe(400);
    expect(deep.body.error.details[0].message).toBe('Nested too deeply (at most 32 levels)');
    // Far deeper than the JSON parser itself copes with is still a clean 400.
    const deeper = await builder.post('/api/cars').set('X-CSRF-Token', builderToken).type('json').send('['.repeat(40_000) + ']'.repeat(40_000));
    expect(deeper.status).toBe(400);
  });
});

describe('/api/verify/<anything>', () => {
  const notFound = { error: { code: 'not_found', message: 'No cage record or check run has this code.' } };
  it.each(['%00', 'abc%00', '%ED%A0%80', '%E0', '%', 'CW-%F0%9F%9A%97', 'x'.repeat(3000)])('answers the documented 404 for a code like %#', async (code) => {
    const res = await agentFor(app).get(`/api/verify/${code}`);
    expect(res.status).toBe(404);
    expect(res.body).toEqual(errorBody(notFound));
  });
});
