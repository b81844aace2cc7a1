// The public verification of a cage record: no sign-in; only the car's name and race number, the
// class, the edition and the status (valid, expired, superseded, revoked); an unknown and a
// malformed code get the very same 404; 30 look-ups a minute per IP, then 429.
import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { CODE_RANDOM_BYTES, newVerificationCode } from '../../backend/src/domain/review/verification-code';
import { makeTestApp, useTestDatabase } from './helpers';
import { act, reviewFixture, submitNew, type ReviewFixture } from './review-fixtures';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;

beforeAll(async () => {
  // A high limit here; the rate limit has its own app below.
  app = makeTestApp(db.ds, { verifyLimits: { windowMs: 60_000, limit: 10_000 } });
  fx = await reviewFixture(db.ds, app);
});

async function issue(): Promise<{ id: string; code: string; submissionId: string }> {
  const { submissionId } = await submitNew(fx.who.builder, fx);
  await act(fx.who.steward, submissionId, { type: 'claim' });
  const res = await act(fx.who.steward, submissionId, { type: 'approve' });
  return { id: res.body.submission.record.id, code: res.body.submission.record.verificationCode, submissionId };
}

const verify = (code: string) => request(app).get(`/api/verify/${encodeURIComponent(code)}`);
const notFound = { error: { code: 'not_found', message: 'No cage record has this code.' } };

describe('GET /api/verify/:code', () => {
  it('shows a valid record to anyone, with nothing personal', async () => {
    const { code } = await issue();
    const res = await verify(code).expect(200);
    expect(Object.keys(res.body.record).sort()).toEqual(['carName', 'className', 'edition', 'raceNumber', 'rulebookTitle', 'status']);
    expect(res.body.record).toMatchObject({ carName: 'Grey Saloon', raceNumber: '47', status: 'valid' });
    const text = JSON.stringify(res.body);
    for (const personal of ['Robin', 'Ashcombe', 'Imogen', 'tarnwick.example', 'photo']) expect(text).not.toContain(personal);
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('reads a typed code with spaces, lower case and O for 0', async () => {
    const { code } = await issue();
    const typed = code.replace(/-/g, ' ').toLowerCase().replace(/0/g, 'o');
    expect((await verify(typed).expect(200)).body.record.status).toBe('valid');
  });

  it('says expired, superseded and revoked', async () => {
    const expired = await issue();
    await db.ds.query(`UPDATE cage_records SET expires_at = now() - interval '1 day' WHERE id = $1`, [expired.id]);
    expect((await verify(expired.code).expect(200)).body.record.status).toBe('expired');

    const older = await issue();
    const newer = await issue();
    await db.ds.query(`UPDATE cage_records SET superseded_by_id = $2, superseded_at = now() WHERE id = $1`, [older.id, newer.id]);
    expect((await verify(older.code).expect(200)).body.record.status).toBe('superseded');

    const revoked = await issue();
    await fx.who.steward.agent.post(`/api/cage-records/${revoked.id}/revoke`).set('X-CSRF-Token', fx.who.steward.token).send({ reason: 'Crash damage to the main hoop.' }).expect(200);
    expect((await verify(revoked.code).expect(200)).body.record.status).toBe('revoked');
  });

  it('answers an unknown and a malformed code identically', async () => {
    const { code } = await issue();
    const oneOff = code.slice(0, -1) + (code.endsWith('0') ? '1' : '0');
    const codes = [newVerificationCode(randomBytes(CODE_RANDOM_BYTES)), oneOff, 'hello', 'x'.repeat(500), '%27%20OR%201%3D1', '0000-0000-0000-0000-0000-0000-0000'];
    const answers = await Promise.all(codes.map(async (c) => {
      const res = await verify(c);
      return { status: res.status, body: res.body, type: res.headers['content-type'] };
    }));
    for (const a of answers) expect(a).toEqual({ status: 404, body: notFound, type: answers[0]!.type });
  });

  it('allows 30 look-ups a minute per IP, then answers 429', async () => {
    const limited = makeTestApp(db.ds);
    const statuses: number[] = [];
    for (let i = 0; i < 31; i++) statuses.push((await request(limited).get('/api/verify/nothing')).status);
    expect(statuses.slice(0, 30).every((s) => s === 404)).toBe(true);
    const last = await request(limited).get('/api/verify/nothing').expect(429);
    expect(last.body.error.code).toBe('rate_limited');
    expect(statuses[30]).toBe(429);
  });
});
