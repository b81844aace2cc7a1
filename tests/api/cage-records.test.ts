// Cage records through the API: issued on approval with the club's prefix, year and a sequence that
// never repeats under concurrent approvals, expiring after the club's validity period, superseding
// the car's earlier record; revoked by a steward or admin with a reason (never by the builder); the
// approved submission's PDF carries the record number, the decision, waivers and the check link.
import { execFileSync } from 'node:child_process';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { addMonthsUtc, parseRecordNumber } from '../../backend/src/domain/review/cage-record';
import { errorBody, makeTestApp, testPublicUrl, useTestDatabase } from './helpers';
import type { SignedIn } from './garage-fixtures';
import { act, failingSpec, reviewFixture, submitNew, type ReviewFixture } from './review-fixtures';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await reviewFixture(db.ds, app);
});

async function approved(spec?: unknown): Promise<{ submissionId: string; record: Record<string, unknown> & { id: string; number: string } }> {
  const { builder, steward } = fx.who;
  const { submissionId } = await submitNew(builder, fx, spec);
  await act(steward, submissionId, { type: 'claim' });
  const res = await act(steward, submissionId, { type: 'approve', note: 'Seen on the car.' });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return { submissionId, record: res.body.submission.record };
}

const revoke = (who: SignedIn, id: string, reason: string) => who.agent.post(`/api/cage-records/${id}/revoke`).set('X-CSRF-Token', who.token).send({ reason });

describe('issuing', () => {
  it('numbers records PREFIX-YEAR-SEQUENCE from the club’s initials, valid for 12 months by default', async () => {
    const { record } = await approved();
    const parsed = parseRecordNumber(record.number)!;
    expect(parsed).toMatchObject({ prefix: 'TVMC', year: new Date().getUTCFullYear() });
    expect(record).toMatchObject({ status: 'valid', className: expect.any(String), edition: expect.any(String), steward: { displayName: 'Imogen Feld' } });
    expect(record.verificationUrl).toBe(`${testPublicUrl}/verify/${record.verificationCode}`);
    expect(new Date(record.expiresAt as string).toISOString()).toBe(addMonthsUtc(new Date(record.issuedAt as string), 12).toISOString());
  });

  it('uses the validity and prefix the club admin sets; stewards may read but not change them', async () => {
    const { steward, admin } = fx.who;
    const url = `/api/clubs/${fx.clubId}/record-settings`;
    expect((await steward.agent.get(url).expect(200)).body.settings).toEqual({ recordPrefix: 'TVMC', validityMonths: 12, saved: false });
    await steward.agent.patch(url).set('X-CSRF-Token', steward.token).send({ validityMonths: 6 }).expect(403);
    const bad = await admin.agent.patch(url).set('X-CSRF-Token', admin.token).send({ validityMonths: 0, recordPrefix: '9X' }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['recordPrefix', 'validityMonths']);
    expect((await admin.agent.patch(url).set('X-CSRF-Token', admin.token).send({ validityMonths: 6, recordPrefix: 'tv' }).expect(200)).body.settings)
      .toEqual({ recordPrefix: 'TV', validityMonths: 6, saved: true });
    const { record } = await approved();
    expect(record.number).toMatch(/^TV-\d{4}-\d{4}$/);
    expect(new Date(record.expiresAt as string).toISOString()).toBe(addMonthsUtc(new Date(record.issuedAt as string), 6).toISOString());
  });

  it('never gives two approvals at once the same sequence number', async () => {
    const { builder, steward } = fx.who;
    const subs = await Promise.all([1, 2, 3].map(() => submitNew(builder, fx)));
    for (const s of subs) await act(steward, s.submissionId, { type: 'claim' });
    const seen = await Promise.all(subs.map((s) => steward.agent.get(`/api/submissions/${s.submissionId}`)));
    const results = await Promise.all(subs.map((s, i) => act(steward, s.submissionId, { type: 'approve' }, seen[i]!.body.submission)));
    expect(results.map((r) => r.status)).toEqual([200, 200, 200]);
    const numbers = results.map((r) => r.body.submission.record.number as string);
    expect(new Set(numbers).size).toBe(3);
  });

  it('supersedes the car’s earlier record when a newer one is issued', async () => {
    const { builder, steward } = fx.who;
    const first = await approved();
    const carId = (first.record.car as { id: string }).id;
    const sheet = (await db.ds.query(`SELECT build_sheet_id FROM submissions WHERE id = $1`, [first.submissionId]))[0].build_sheet_id;
    const run = await builder.agent.post(`/api/build-sheets/${sheet}/check-runs`).set('X-CSRF-Token', builder.token).expect(201);
    const sub = await builder.agent.post('/api/submissions').set('X-CSRF-Token', builder.token).send({ checkRunId: run.body.checkRun.id }).expect(201);
    await act(steward, sub.body.submission.id, { type: 'claim' });
    const second = await act(steward, sub.body.submission.id, { type: 'approve' });
    expect(second.body.submission.record.car.id).toBe(carId);
    expect((await steward.agent.get(`/api/cage-records/${first.record.id}`).expect(200)).body.record.status).toBe('superseded');
    expect(second.body.submission.history[0]).toMatchObject({ id: first.submissionId, recordNumber: first.record.number });
  });
});

describe('reading and revoking', () => {
  it('shows the record to the owner and the club’s reviewers only', async () => {
    const { record } = await approved();
    await fx.who.builder.agent.get(`/api/cage-records/${record.id}`).expect(200);
    for (const who of [fx.who.otherBuilder, fx.who.outsider, fx.who.foreignSteward]) {
      const res = await who.agent.get(`/api/cage-records/${record.id}`).expect(404);
      expect(res.body).toEqual(errorBody({ error: { code: 'not_found', message: 'Cage record not found.' } }));
    }
    await fx.who.foreignSteward.agent.post(`/api/cage-records/${record.id}/revoke`).set('X-CSRF-Token', fx.who.foreignSteward.token).send({ reason: 'Crash damage to the main hoop.' }).expect(404);
  });

  it('needs a reason, refuses the builder, revokes once, logs it and mails the builder', async () => {
    const { record } = await approved();
    expect((await revoke(fx.who.builder, record.id, 'Crash damage to the main hoop.')).status).toBe(403);
    const noReason = await revoke(fx.who.steward, record.id, 'bent');
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details).toEqual([{ path: 'reason', message: expect.stringContaining('reason for revoking') }]);
    const ok = await revoke(fx.who.admin, record.id, 'Crash damage to the main hoop at round 3.');
    expect(ok.status).toBe(200);
    expect(ok.body.record).toMatchObject({ status: 'revoked', revokedReason: 'Crash damage to the main hoop at round 3.', canRevoke: false });
    expect((await revoke(fx.who.steward, record.id, 'Crash damage to the main hoop.')).status).toBe(409);
    const audit = await db.ds.query(`SELECT action FROM audit_entries WHERE entity_id = $1 ORDER BY created_at`, [record.id]);
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['cage_record.issued', 'cage_record.revoked']);
    const mail = await db.ds.query(`SELECT subject FROM outbox_messages WHERE subject = $1`, [`Cage record ${record.number} revoked`]);
    expect(mail).toHaveLength(1);
  });
});

describe('the approved submission’s PDF', () => {
  it('carries the record number, the decision, the waivers and the verification link', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx, failingSpec());
    await act(steward, submissionId, { type: 'claim' });
    const pre = await builder.agent.get(`/api/submissions/${submissionId}/report.pdf`).expect(409);
    expect(pre.body.error.code).toBe('conflict');
    const s = (await steward.agent.get(`/api/submissions/${submissionId}`)).body.submission;
    for (const key of s.overall.blocking) await act(steward, submissionId, { type: 'waive', findingKey: key, reason: 'Measured 0.095 in wall with a sonic gauge.' });
    const res = await act(steward, submissionId, { type: 'approve' });
    const record = res.body.submission.record;
    const pdf = await builder.agent.get(`/api/submissions/${submissionId}/report.pdf?units=imperial`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const dir = await mkdtemp(join(tmpdir(), 'cw-review-pdf-'));
    await writeFile(join(dir, 'r.pdf'), pdf.body as Buffer);
    const text = execFileSync('pdftotext', [join(dir, 'r.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain(`Cage record ${record.number}`);
    expect(text).toMatch(/APPROVED WITH \d+ WAIVERS?/);
    expect(text).toMatch(/Approved with \d+ waivers?, by Imogen Feld/);
    expect(text).toContain('Measured 0.095 in wall with a sonic gauge. (Imogen Feld)');
    expect(text).toContain('Waived by Imogen Feld: Measured 0.095 in wall with a sonic gauge.');
    // pdftotext joins a code wrapped at one of its dashes, so compare without them.
    expect(text.replace(/-/g, '')).toContain(`${testPublicUrl}/verify/${record.verificationCode}`.replace(/-/g, ''));
    await fx.who.otherBuilder.agent.get(`/api/submissions/${submissionId}/report.pdf`).expect(404);
  });
});
