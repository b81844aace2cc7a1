// No 500 on any input (issue 12, §3): fast-check posts generated bodies to every write endpoint of the
// API (found in the app's own router, so a new route is fuzzed without being listed here): strings
// with control characters, NUL and lone surrogates; keys like __proto__; deep nesting; huge, negative
// and fractional numbers; and valid bodies with one value replaced by such a thing, so the services
// behind the contracts are reached too. Route parameters are sometimes replaced by hostile strings as
// well. No answer may be a 5xx, and one carrying a NUL or a surrogate must be a 400 validation_failed.
// The default run is short for CI (FUZZ_RUNS, default 400 bodies in all); `npm run fuzz` runs 10,000.
// A photo upload gets generated captions through a multipart form the same way.
import type { Express } from 'express';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { testJpeg } from './garage-fixtures';
import { agentFor, demo, makeTestApp, signIn, useTestDatabase, type Agent } from './helpers';

const db = useTestDatabase();
const totalRuns = Number(process.env.FUZZ_RUNS ?? 400);
const seed = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;

interface Endpoint {
  method: 'post' | 'put' | 'patch' | 'delete';
  path: string;
}

/** Every write route mounted under /api, read from Express's own router. */
function writeEndpoints(app: Express): Endpoint[] {
  type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] }; name?: string };
  const out: Endpoint[] = [];
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const m of Object.keys(layer.route.methods)) {
          if (m === 'post' || m === 'put' || m === 'patch' || m === 'delete') out.push({ method: m, path: layer.route.path });
        }
      } else if (layer.handle?.stack) walk(layer.handle.stack);
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack);
  return out;
}

const evilChar = fc.constantFrom('\u0000', '\uD800', '\uDBFF', '\uDC00', '\uDFFF', '\u0001', '\u0008', '\u001b', '\u007f', '\u0085', '\u2028', '\u202e', '\uFEFF', '\uFFFF', '%00', '\\', '"', '\n', '\r\n', '\t');
const evilString = fc.oneof(
  fc.string({ maxLength: 20 }),
  fc.string({ unit: 'binary', maxLength: 20 }),
  fc.array(fc.oneof(evilChar, fc.string({ maxLength: 3 })), { maxLength: 8 }).map((a) => a.join('')),
  fc.constantFrom('', ' ', '__proto__', 'constructor', 'x'.repeat(5000), '0', '-1', 'NaN', 'true', 'null', '../../etc/passwd', '<script>', '0000-00-00', '2028-02-30'),
);
const evilNumber = fc.oneof(
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.constantFrom(0, -0, -1, 0.5, -0.5, 2 ** 31, -(2 ** 31) - 1, 2 ** 53 + 2, -(2 ** 63), 1e21, 1e308, -1e308, 5e-324),
);
const leaf = fc.oneof(evilString, evilNumber, fc.boolean(), fc.constant(null));
const key = fc.oneof(
  fc.string({ maxLength: 10 }),
  evilString,
  fc.constantFrom('name', 'lockVersion', 'document', 'specification', 'caption', 'email', 'password', 'roles', 'classId', 'members', 'text', 'constructor', 'prototype'),
);
const { node } = fc.letrec((tie) => ({
  node: fc.oneof({ depthSize: 'small', maxDepth: 4 }, leaf, fc.array(tie('node'), { maxLength: 4 }), fc.dictionary(key, tie('node'), { maxKeys: 4 })),
}));

/** Raw JSON texts that JSON.stringify cannot make: own __proto__ keys, numbers beyond doubles, deep nesting. */
const rawJson = fc.oneof(
  fc.tuple(fc.constantFrom('__proto__', 'constructor'), node).map(([k, v]) => `{"${k}": ${JSON.stringify(v) ?? 'null'}, "name": "x"}`),
  fc.constantFrom('{"name": 1e400}', '{"lockVersion": -1e400}', '{"year": 123456789012345678901234567890}', '{"name": "\\u0000"}', '{"name": "\\ud800"}', '{"a": "\\udc00x"}'),
  fc.integer({ min: 30, max: 5000 }).map((n) => '['.repeat(n) + ']'.repeat(n)),
  fc.integer({ min: 30, max: 3000 }).map((n) => '{"a":'.repeat(n) + '1' + '}'.repeat(n)),
);

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** A valid body with the value at one of its paths replaced by `value`. */
function mutate(template: Json, pick: number, value: unknown): unknown {
  const copy = structuredClone(template) as Json;
  const slots: { parent: Json[] | Record<string, Json>; key: string | number }[] = [];
  const walk = (v: Json) => {
    if (Array.isArray(v)) {
      v.forEach((x, i) => {
        slots.push({ parent: v, key: i });
        walk(x);
      });
    } else if (v && typeof v === 'object') {
      for (const k of Object.keys(v)) {
        slots.push({ parent: v, key: k });
        walk(v[k]!);
      }
    }
  };
  walk(copy);
  if (slots.length === 0) return value;
  const slot = slots[pick % slots.length]!;
  (slot.parent as Record<string | number, unknown>)[slot.key] = value;
  return copy;
}

/** Independent of the server's own check: a NUL or an unpaired surrogate anywhere in a value or a key. */
function hasUnsafeText(v: unknown, depth = 0): boolean {
  if (depth > 200) return false;
  if (typeof v === 'string') return v.includes('\u0000') || /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/.test(v);
  if (Array.isArray(v)) return v.some((x) => hasUnsafeText(x, depth + 1));
  if (v && typeof v === 'object') return Object.entries(v).some(([k, x]) => hasUnsafeText(k) || hasUnsafeText(x, depth + 1));
  return false;
}

let app: Express;
let builder: { agent: Agent; token: string };
let admin: { agent: Agent; token: string };
const params: Record<string, string> = {};
/** The sheet the photo-upload fuzz posts to (see beforeAll). */
let photoSheetId: string;
const templates: Record<string, Json> = {};

async function signedIn(email: string) {
  const agent = agentFor(app);
  return { agent, token: await signIn(agent, email) };
}

beforeAll(async () => {
  app = makeTestApp(db.ds, {
    limits: {
      verify: { windowMs: 60_000, limit: 1_000_000 },
      signIn: { windowMs: 60_000, perIp: 1_000_000, perEmailAndIp: 1_000_000, delay: { freeFailures: 1_000_000, firstDelayMs: 0, maxDelayMs: 0 } },
      passwordChange: { windowMs: 60_000, limit: 1_000_000 },
      passwordReset: { windowMs: 60_000, perIp: 1_000_000, perEmail: 1_000_000 },
    },
  });
  builder = await signedIn(demo.builder);
  admin = await signedIn(demo.admin);
  const q = async <T>(sql: string, values: unknown[] = []) => ((await db.ds.query(sql, values)) as T[])[0]!;
  const club = await q<{ id: string }>(`SELECT id FROM clubs WHERE slug = 'tarnwick-vale'`);
  const version = await q<{ id: string; rulebook_id: string }>(
    `SELECT v.id, v.rulebook_id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.slug = 'tarnwick-vale-mc-cage-regulations-2027' AND v.status = 'published'`,
  );
  // A member of its own for the member routes, so fuzzing them cannot remove the builder from the club.
  const member = await q<{ id: string }>(
    `INSERT INTO users (email, display_name, password_hash) SELECT 'fuzz-member@tarnwick.example', 'Fuzz member', password_hash FROM users WHERE email = $1 RETURNING id`,
    [demo.builder],
  );
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{builder}')`, [member.id, club.id]);
  const car = await builder.agent.post('/api/cars').set('X-CSRF-Token', builder.token).send({ name: 'Fuzz car', chassisType: 'unibody' }).expect(201);
  const sheet = await builder.agent
    .post(`/api/cars/${car.body.car.id}/build-sheets`)
    .set('X-CSRF-Token', builder.token)
    .send({ name: 'Fuzz sheet', clubId: club.id, rulesetVersionId: version.id, classId: 'club-saloon' })
    .expect(201);
  const sheetId: string = sheet.body.sheet?.id ?? sheet.body.buildSheet?.id ?? sheet.body.id;
  // The photo fuzz gets a car and sheet of its own: the route fuzz may archive or delete the first ones,
  // and an upload to an archived sheet is refused (409) before its fields are read.
  const photoCar = await builder.agent.post('/api/cars').set('X-CSRF-Token', builder.token).send({ name: 'Fuzz photo car', chassisType: 'unibody' }).expect(201);
  const photoSheet = await builder.agent
    .post(`/api/cars/${photoCar.body.car.id}/build-sheets`)
    .set('X-CSRF-Token', builder.token)
    .send({ name: 'Fuzz photo sheet', clubId: club.id, rulesetVersionId: version.id, classId: 'club-saloon' })
    .expect(201);
  photoSheetId = photoSheet.body.sheet?.id ?? photoSheet.body.buildSheet?.id ?? photoSheet.body.id;
  const draft = await admin.agent.post(`/api/rulebooks/${version.rulebook_id}/drafts`).set('X-CSRF-Token', admin.token).expect(201);
  Object.assign(params, {
    carId: car.body.car.id,
    sheetId,
    clubId: club.id,
    userId: member.id,
    versionId: draft.body.version.id,
    otherId: version.id,
    rulebookId: version.rulebook_id,
  });
  templates['post /cars'] = { name: 'Fuzz car', chassisType: 'unibody', make: 'Make', year: 2001, raceNumber: '12' };
  templates['patch /cars/:carId'] = { name: 'Renamed', year: 1999 };
  templates['post /cars/:carId/build-sheets'] = { name: 'Sheet', clubId: club.id, rulesetVersionId: version.id, classId: 'club-saloon', specification: { vehicle: { classId: 'club-saloon' }, members: [] } };
  templates['put /ruleset-drafts/:versionId'] = { lockVersion: draft.body.version.lockVersion, document: draft.body.version.document };
  templates['post /ruleset-drafts/:versionId/import'] = { lockVersion: draft.body.version.lockVersion, text: JSON.stringify(draft.body.version.document) };
  templates['post /ruleset-drafts/:versionId/publish'] = { lockVersion: -5, effectiveDate: '2029-01-01' };
  templates['post /checks'] = {
    rulesetVersionId: version.id,
    classId: 'club-saloon',
    specification: { vehicle: { classId: 'club-saloon', weightWithDriverKg: 1200, chassis: 'unibody' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 2.4, material: 'mild_steel', process: 'dom', bends: [] }] },
  };
  templates['patch /account'] = { displayName: 'Robin Ashcombe', preferredUnits: 'metric' };
  templates['post /auth/login'] = { email: 'nobody@tarnwick.example', password: 'wrong-password' };
  templates['patch /build-sheets/:sheetId'] = { name: 'Renamed sheet' };
}, 60_000);

/** Garage things belong to the builder; rulebooks, members and reviews to the admin. */
function whoFor(path: string) {
  return /^\/(cars|build-sheets|photos|checks|fabrication|submissions$)/.test(path) ? builder : admin;
}

// Sign-out and the password change would end the fuzzing sessions; they get sessions of their own.
const sessionEnders = new Set(['post /auth/logout', 'post /auth/password']);

function fill(path: string, hostile: (string | null)[]): string {
  let i = 0;
  return path.replace(/:(\w+)/g, (_m, name: string) => {
    const h = hostile[i++] ?? null;
    return encodeURIComponent(h ?? params[name] ?? '00000000-0000-4000-8000-000000000000');
  });
}

describe('fuzzing every write endpoint', () => {
  it('never answers 5xx, and refuses NUL and lone surrogates with 400 validation_failed', async () => {
    const endpoints = writeEndpoints(app).filter((e) => e.path !== '/photos'); // multipart: below
    expect(endpoints.length).toBeGreaterThan(20);
    const runsEach = Math.max(3, Math.ceil(totalRuns / endpoints.length));
    const fiveXx: string[] = [];
    const statuses: Record<string, Record<number, number>> = {};
    for (const e of endpoints) {
      const routeKey = `${e.method} ${e.path}`;
      const template = templates[routeKey] ?? null;
      const body = fc.oneof(
        { weight: 3, arbitrary: node.map((v) => ({ json: v as unknown })) },
        { weight: 1, arbitrary: rawJson.map((raw) => ({ raw })) },
        ...(template ? [{ weight: 4, arbitrary: fc.tuple(fc.nat(), fc.oneof(leaf, node)).map(([pick, v]) => ({ json: mutate(template, pick, v) })) }] : []),
      );
      // One entry per route parameter: null keeps the real value, a string replaces it.
      const paramCount = (e.path.match(/:\w+/g) ?? []).length;
      const hostileParams = fc.oneof(
        { weight: 4, arbitrary: fc.constant([] as (string | null)[]) },
        { weight: paramCount > 0 ? 1 : 0, arbitrary: fc.array(fc.option(evilString), { minLength: paramCount, maxLength: paramCount }) },
      );
      await fc.assert(
        fc.asyncProperty(body, hostileParams, async (b, hostile) => {
          let who = whoFor(e.path);
          if (sessionEnders.has(routeKey)) who = await signedIn(demo.steward);
          let url: string;
          try {
            url = `/api${fill(e.path, hostile)}`;
          } catch {
            return; // a lone surrogate cannot be percent-encoded: no client can send it as a path
          }
          const req = who.agent[e.method](url).set('X-CSRF-Token', who.token).type('json');
          const res = 'raw' in b ? await req.send(b.raw as string) : await req.send(JSON.stringify(b.json ?? null));
          const tally = (statuses[routeKey] ??= {});
          tally[res.status] = (tally[res.status] ?? 0) + 1;
          if (res.status >= 500) fiveXx.push(`${routeKey} → ${res.status} ${JSON.stringify(res.body)}`);
          expect(res.status, `${routeKey} ${url} answered ${res.status}: ${JSON.stringify(res.body)}`).toBeLessThan(500);
          let sent: unknown = 'json' in b ? b.json : undefined;
          if ('raw' in b) {
            try {
              sent = JSON.parse(b.raw as string);
            } catch {
              sent = undefined; // malformed or too deep for JSON.parse: the server refuses it as well
            }
          }
          if (hasUnsafeText(sent)) expect(res.status, `${routeKey} let a NUL or a lone surrogate through`).toBe(400);
          if (hostile.some((h) => h !== null && hasUnsafeText(h))) expect(res.status, `${routeKey} let a hostile parameter through`).toBeGreaterThanOrEqual(400);
        }),
        { numRuns: runsEach, ...(seed !== undefined ? { seed } : {}) },
      );
    }
    if (process.env.FUZZ_REPORT) console.log(JSON.stringify(statuses, null, 1));
    expect(fiveXx).toEqual([]);
  }, 600_000);

  it('never answers 5xx to generated multipart fields (captions, member ids, areas) on a photo upload', async () => {
    const jpeg = await testJpeg(64, 48);
    const runs = Math.max(10, Math.ceil(totalRuns / 20));
    await fc.assert(
      fc.asyncProperty(fc.record({ captions: evilString, memberIds: evilString, areas: evilString }), fc.oneof(fc.constant('fuzz.jpg'), evilString), async (fields, fileName) => {
        const res = await builder.agent
          .post(`/api/build-sheets/${photoSheetId}/photos`)
          .set('X-CSRF-Token', builder.token)
          .attach('photos', jpeg, fileName)
          .field('captions', fields.captions)
          .field('memberIds', fields.memberIds)
          .field('areas', fields.areas);
        expect(res.status, JSON.stringify(res.body)).toBeLessThan(500);
        if (Object.values(fields).some((f) => hasUnsafeText(f)) || hasUnsafeText(fileName)) expect(res.body.error?.code).toBe('validation_failed');
        // Keep the sheet under its photo limit.
        for (const p of (res.body.photos ?? []) as { id: string }[]) await builder.agent.delete(`/api/photos/${p.id}`).set('X-CSRF-Token', builder.token);
      }),
      { numRuns: runs, ...(seed !== undefined ? { seed } : {}) },
    );
  }, 600_000);
});
