// More than one server (issue 12, §6): two real server processes on two ports against one database, as
// a series with several machines would run them. Server A runs the fake SMTP server, server B sends its
// mail there; photos go to the S3 fake the global setup started (never a shared folder: each server's
// UPLOAD_DIR is a folder of its own that must stay empty). It shows that a session made on one is valid
// on the other (and ends on both), that a limit reached on one holds on the other, that a publish job
// runs once, that its mail is sent once, and that a photo uploaded through one is served by the other.
import { randomBytes } from 'node:crypto';
import { mkdtemp, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobProgressWire } from '../../backend/src/contracts/jobs';
import { demoPassword } from '../../backend/src/db/seed-data';
import { S3PhotoStorage } from '../../backend/src/services/photos/s3-photo-storage';
import { demo, fakeS3Settings, testDatabaseUrl, useTestDatabase } from './helpers';
import { testJpeg } from './garage-fixtures';
import { clearMailTables } from './mail-helpers';
import { passingSaloonSpec, withSaloonWall, type DocLike } from './rulebook-admin-fixtures';
import { freePort, startServer, type ServerProcess } from './support/processes';

const db = useTestDatabase();
const s3 = fakeS3Settings();
let a: ServerProcess;
let b: ServerProcess;
const uploadDirs: string[] = [];

/** Cookies (the session, and whatever else the server sets) kept across requests to either server. */
class Browser {
  private readonly jar = new Map<string, string>();
  token = '';

  async call(base: string, method: string, path: string, body?: unknown): Promise<{ status: number; body: unknown; bytes: Buffer }> {
    const headers: Record<string, string> = {};
    const cookie = [...this.jar].map(([k, v]) => `${k}=${v}`).join('; ');
    if (cookie) headers.cookie = cookie;
    if (this.token && method !== 'GET') headers['x-csrf-token'] = this.token;
    let payload: BodyInit | undefined;
    if (body instanceof FormData) payload = body;
    else if (body !== undefined) {
      headers['content-type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const res = await fetch(`${base}${path}`, { method, headers, ...(payload ? { body: payload } : {}) });
    for (const set of res.headers.getSetCookie()) {
      const [pair] = set.split(';');
      const at = pair!.indexOf('=');
      const value = pair!.slice(at + 1);
      if (value === '' || /expires=Thu, 01 Jan 1970/i.test(set)) this.jar.delete(pair!.slice(0, at));
      else this.jar.set(pair!.slice(0, at), value);
    }
    const bytes = Buffer.from(await res.arrayBuffer());
    let parsed: unknown = null;
    if ((res.headers.get('content-type') ?? '').includes('json')) parsed = JSON.parse(bytes.toString('utf8'));
    return { status: res.status, body: parsed, bytes };
  }

  async refreshToken(base: string): Promise<void> {
    this.token = ((await this.call(base, 'GET', '/api/auth/csrf')).body as { token: string }).token;
  }

  /** Signs in through `base`; returns the status of the sign-in. */
  async signIn(base: string, email: string, password = demoPassword): Promise<number> {
    await this.refreshToken(base);
    const res = await this.call(base, 'POST', '/api/auth/login', { email, password });
    if (res.status === 200) await this.refreshToken(base);
    return res.status;
  }
}

async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const got = await probe();
    if (got) return got;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

beforeAll(async () => {
  await clearMailTables(db.ds);
  const smtpPort = await freePort();
  const common = {
    DATABASE_URL: testDatabaseUrl(),
    // Every server signs session cookies with the same secret (NODE_ENV=test would give each its own).
    SESSION_SECRET: randomBytes(32).toString('base64url'),
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    PHOTO_STORAGE: 's3', S3_BUCKET: s3.bucket, S3_ENDPOINT: s3.endpoint!, S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_PREFIX: s3.prefix,
    RECHECK_WORKERS: '1',
  };
  const dirs = await Promise.all([1, 2].map(() => mkdtemp(join(tmpdir(), 'cw-multi-uploads-'))));
  uploadDirs.push(...dirs);
  // A first: it runs the fake SMTP server both send to, and migrates (B finds nothing to do).
  a = await startServer({ ...common, FAKE_SMTP: 'true', UPLOAD_DIR: dirs[0]! });
  b = await startServer({ ...common, FAKE_SMTP: 'false', UPLOAD_DIR: dirs[1]! });
}, 120_000);

afterAll(async () => {
  await Promise.all([a?.kill('SIGTERM'), b?.kill('SIGTERM')]);
}, 60_000);

describe('two server processes against one database', () => {
  it('share sessions: made on one, valid on the other, ended on both', async () => {
    const builder = new Browser();
    expect(await builder.signIn(a.baseUrl, demo.builder)).toBe(200);
    const me = await builder.call(b.baseUrl, 'GET', '/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ user: { email: demo.builder } });
    // A write on B with the token A handed out (it lives in the shared session).
    const car = await builder.call(b.baseUrl, 'POST', '/api/cars', { name: 'Two-server saloon', chassisType: 'unibody' });
    expect(car.status).toBe(201);
    expect((await builder.call(b.baseUrl, 'POST', '/api/auth/logout')).status).toBe(204);
    expect((await builder.call(a.baseUrl, 'GET', '/api/auth/me')).status).toBe(401);
  });

  // Sign-in limits are counted in PostgreSQL (decision 0010): the pair of this e-mail and this IP,
  // refused on A after its failures, is refused on B as well.
  it('share limits: failed sign-ins refused on one are refused on the other', async () => {
    const guesser = new Browser();
    let refusedAfter = 0;
    for (let i = 1; i <= 40; i++) {
      const status = await guesser.signIn(a.baseUrl, demo.steward, 'not-the-password');
      if (status === 429) {
        refusedAfter = i;
        break;
      }
      expect(status).toBe(401);
    }
    expect(refusedAfter).toBeGreaterThan(1);
    expect(await guesser.signIn(b.baseUrl, demo.steward, 'not-the-password')).toBe(429);
  }, 120_000);

  it('run a publish job once, send its mail once, and serve a photo uploaded through the other', async () => {
    const builder = new Browser();
    expect(await builder.signIn(a.baseUrl, demo.builder)).toBe(200);
    const [fx] = await db.ds.query(
      `SELECT v.id AS "versionId", v.rulebook_id AS "rulebookId", r.club_id AS "clubId" FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id
       WHERE r.slug = 'tarnwick-vale-mc-cage-regulations-2027' AND v.status = 'published'`,
    );
    const car = await builder.call(a.baseUrl, 'POST', '/api/cars', { name: 'Harbour Saloon', chassisType: 'unibody' });
    const carId = (car.body as { car: { id: string } }).car.id;
    const sheet = await builder.call(a.baseUrl, 'POST', `/api/cars/${carId}/build-sheets`, { name: 'Series cage', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: passingSaloonSpec() });
    expect(sheet.status).toBe(201);
    const sheetId = (sheet.body as { buildSheet: { id: string } }).buildSheet.id;
    const run = await builder.call(b.baseUrl, 'POST', `/api/build-sheets/${sheetId}/check-runs`);
    expect((run.body as { checkRun: { overallVerdict: string } }).checkRun.overallVerdict).toBe('pass');

    // The photo: uploaded through A, read through B; its bytes are in the bucket, nothing on either disk.
    const form = new FormData();
    form.append('photos', new Blob([new Uint8Array(await testJpeg(640, 480))], { type: 'image/jpeg' }), 'main-hoop.jpg');
    form.append('captions', 'Main hoop foot, left');
    const up = await builder.call(a.baseUrl, 'POST', `/api/build-sheets/${sheetId}/photos`, form);
    expect(up.status).toBe(201);
    const [photo] = (up.body as { photos: { id: string; imageUrl: string; thumbnailUrl: string }[] }).photos;
    const fromA = await builder.call(a.baseUrl, 'GET', photo!.imageUrl);
    const fromB = await builder.call(b.baseUrl, 'GET', photo!.imageUrl);
    expect([fromA.status, fromB.status]).toEqual([200, 200]);
    expect(fromB.bytes.equals(fromA.bytes)).toBe(true);
    expect((await builder.call(b.baseUrl, 'GET', photo!.thumbnailUrl)).status).toBe(200);
    const listed = await new S3PhotoStorage(s3).client.send(new ListObjectsV2Command({ Bucket: s3.bucket, Prefix: s3.prefix }));
    expect((listed.Contents ?? []).map((o) => o.Key!.slice(s3.prefix.length)).sort()).toEqual([`sheets/${sheetId}/${photo!.id}.jpg`, `sheets/${sheetId}/${photo!.id}.thumb.jpg`]);
    for (const dir of uploadDirs) expect(await readdir(dir, { recursive: true })).toEqual([]);

    // The publish: made through B, its job picked up by whichever server polls first, and only by it.
    const admin = new Browser();
    expect(await admin.signIn(b.baseUrl, demo.admin)).toBe(200);
    const draft = (await admin.call(b.baseUrl, 'POST', `/api/rulebooks/${fx.rulebookId}/drafts`)).body as { version: { id: string; lockVersion: number; document: DocLike } };
    // 0.120 in walls for the saloon table (the demo rulebook is in inches; F-UNIT-1: 1 in = 25.4 mm).
    const saved = await admin.call(a.baseUrl, 'PUT', `/api/ruleset-drafts/${draft.version.id}`, { lockVersion: draft.version.lockVersion, document: withSaloonWall(draft.version.document, 0.12) });
    expect(saved.status).toBe(200);
    const pub = await admin.call(b.baseUrl, 'POST', `/api/ruleset-drafts/${draft.version.id}/publish`, { lockVersion: (saved.body as { draft: { lockVersion: number } }).draft.lockVersion, effectiveDate: '2028-01-01' });
    expect(pub.status).toBe(202);
    const jobId = (pub.body as { published: { jobId: string } }).published.jobId;
    const job = await waitFor('the publish job', async () => {
      const j = (await admin.call(a.baseUrl, 'GET', `/api/jobs/${jobId}`)).body as { job: JobProgressWire };
      return j.job.state === 'completed' || j.job.state === 'failed' ? j.job : null;
    });
    expect(job).toMatchObject({ state: 'completed', attempts: 1, failed: 0 });
    const results: { n: number; sheets: number }[] = await db.ds.query(`SELECT count(*)::int AS n, count(DISTINCT build_sheet_id)::int AS sheets FROM ruleset_recheck_results WHERE job_id = $1`, [jobId]);
    expect(results[0]).toEqual({ n: job.total, sheets: job.total });
    const completions: unknown[] = await db.ds.query(`SELECT 1 FROM audit_entries WHERE action = 'ruleset.recheck_completed' AND details->>'jobId' = $1`, [jobId]);
    expect(completions).toHaveLength(1);

    // The mail about the sheet's new verdict: one outbox row, sent once, caught once by A's fake SMTP.
    const subject = '%new pre-check verdict for Harbour Saloon';
    const outbox = await waitFor('the verdict mail to be sent', async () => {
      const rows: { status: string; attempts: number }[] = await db.ds.query(`SELECT status, attempts FROM outbox_messages WHERE subject LIKE $1`, [subject]);
      return rows.length === 1 && rows[0]!.status === 'sent' ? rows : null;
    });
    expect(outbox).toEqual([{ status: 'sent', attempts: 1 }]);
    // Both dispatchers poll every 5 s: give each time for another round, then count again.
    await new Promise((r) => setTimeout(r, 11_000));
    const caught: { to_address: string }[] = await db.ds.query(`SELECT to_address FROM dev_mailbox WHERE subject LIKE $1`, [subject]);
    expect(caught).toEqual([{ to_address: demo.builder }]);
    expect(await db.ds.query(`SELECT status, attempts FROM outbox_messages WHERE subject LIKE $1`, [subject])).toEqual([{ status: 'sent', attempts: 1 }]);
  }, 120_000);
});
