// The public verification of a code: no sign-in. A cage record shows only the car's name and race
// number, the class, the edition and the status (valid, expired, superseded, revoked); a check run's
// code (issue 9 §5) says it is a pre-check of its date, not a cage record, with its result, and older
// 24-character check-run codes still verify. Stewards look a check run up by its code. An unknown and
// a malformed code get the very same 404; 30 look-ups a minute per IP, then 429.
import { execFileSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { calendarDateIn } from '../../backend/src/domain/dates';
import { CODE_RANDOM_BYTES, newVerificationCode } from '../../backend/src/domain/review/verification-code';
import { clearLimits, errorBody, hasErrorBody, makeTestApp, useTestDatabase } from './helpers';
import { act, failingSpec, reviewFixture, savedRun, submitNew, type ReviewFixture } from './review-fixtures';
import { carWithSheet } from './garage-fixtures';

const db = useTestDatabase();
/** pdftotext of the whole PDF, line breaks folded so sentences match whole. */
const pdfText = (pdf: Buffer) => execFileSync('pdftotext', ['-', '-'], { input: pdf, encoding: 'utf8' }).replace(/\s+/g, ' ');
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;

beforeAll(async () => {
  // A high limit here; the rate limit has its own app below.
  app = makeTestApp(db.ds, { limits: { verify: { windowMs: 60_000, limit: 10_000 } } });
  fx = await reviewFixture(db.ds, app);
});

async function issue(): Promise<{ id: string; code: string; submissionId: string }> {
  const { submissionId } = await submitNew(fx.who.builder, fx);
  await act(fx.who.steward, submissionId, { type: 'claim' });
  const res = await act(fx.who.steward, submissionId, { type: 'approve' });
  return { id: res.body.submission.record.id, code: res.body.submission.record.verificationCode, submissionId };
}

const verify = (code: string) => request(app).get(`/api/verify/${encodeURIComponent(code)}`);
const notFound = { error: { code: 'not_found', message: 'No cage record or check run has this code.' } };

describe('GET /api/verify/:code', () => {
  it('shows a valid record to anyone, with nothing personal', async () => {
    const { code } = await issue();
    const res = await verify(code).expect(200);
    expect(res.body.kind).toBe('cage_record');
    // The record number, club, make, model and expiry too (issue 13), and the latest inspection's date and seal only.
    expect(Object.keys(res.body.record).sort()).toEqual([
      'carName', 'className', 'clubName', 'edition', 'expiresAt', 'expiresOn', 'lastInspection', 'make', 'model', 'raceNumber', 'recordNumber', 'rulebookTitle', 'status',
    ]);
    expect(res.body.record).toMatchObject({ carName: 'Grey Saloon', make: 'Varden', model: 'Corsair', raceNumber: '47', status: 'valid', clubName: 'Tarnwick Vale Motor Club', lastInspection: null });
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
    for (const a of answers) expect(a).toEqual({ status: 404, body: errorBody(notFound), type: answers[0]!.type });
  });

  it('allows 30 look-ups a minute per IP, then answers 429', async () => {
    // The counters live in PostgreSQL and the look-ups above counted under the same IP: start afresh.
    await clearLimits(db.ds);
    const limited = makeTestApp(db.ds);
    const statuses: number[] = [];
    for (let i = 0; i < 31; i++) statuses.push((await request(limited).get('/api/verify/nothing')).status);
    expect(statuses.slice(0, 30).every((s) => s === 404)).toBe(true);
    const last = await request(limited).get('/api/verify/nothing').expect(429);
    expect(last.body.error.code).toBe('rate_limited');
    expect(Number(last.headers['retry-after'])).toBeGreaterThan(0);
    expect(statuses[30]).toBe(429);
  });
});

/** A run saved before one code form served both kinds: the same row under a 24-character code. */
async function legacyCopyOf(runId: string, legacyCode: string): Promise<string> {
  const rows = await db.ds.query(
    `INSERT INTO check_runs (ruleset_version_id, class_id, specification, report, overall_verdict, created_by, created_at, build_sheet_revision_id, verification_code)
     SELECT ruleset_version_id, class_id, specification, report, overall_verdict, created_by, created_at - interval '30 days', build_sheet_revision_id, $2
     FROM check_runs WHERE id = $1 RETURNING id`,
    [runId, legacyCode],
  );
  return rows[0].id as string;
}

describe('check-run codes (issue 9 §5)', () => {
  let runId: string;
  let code: string;
  let createdAt: Date;
  beforeAll(async () => {
    const { sheetId } = await carWithSheet(fx.who.builder, fx, failingSpec());
    runId = await savedRun(fx.who.builder, sheetId);
    const run = (await fx.who.builder.agent.get(`/api/check-runs/${runId}`).expect(200)).body.checkRun;
    code = run.verificationCode;
    createdAt = new Date(run.createdAt as string);
  });

  it('new runs get the one current form: grouped, with a check character', () => {
    expect(code).toMatch(/^([0-9A-HJKMNP-TV-Z]{4}-){6}[0-9A-HJKMNP-TV-Z]{4}$/);
  });

  it('the public page says a check-run code is a pre-check of its date with its result, not a cage record, and shows no people or photos', async () => {
    const res = await verify(code).expect(200);
    expect(res.body).toEqual({
      kind: 'check_run',
      checkRun: {
        // The demo club's date (its time zone, a club setting), as the run's PDF prints it.
        checkedOn: calendarDateIn(createdAt, 'Europe/London'), timeZone: 'Europe/London', verdict: 'fail', className: 'Club Saloon (full cage)', rulebookTitle: 'Tarnwick Vale MC Cage Regulations', edition: '2027',
        carName: 'Grey Saloon', raceNumber: '47',
      },
    });
    const text = JSON.stringify(res.body);
    for (const personal of ['Robin', 'Ashcombe', 'tarnwick.example', 'photo', 'specification', runId]) expect(text).not.toContain(personal);
    expect(res.headers['cache-control']).toBe('no-store');
    // Typed loosely, as from paper.
    expect((await verify(code.replace(/-/g, ' ').toLowerCase()).expect(200)).body.kind).toBe('check_run');
  });

  it("the run's date is the club's calendar date: a club far from UTC reads its own day, on the page and in the PDF", async () => {
    const [{ time_zone: was }] = await db.ds.query(`SELECT time_zone FROM clubs WHERE id = $1`, [fx.clubId]);
    // A zone whose date differs from UTC's at the moment the run was made, whatever the hour: 12 hours
    // behind in the UTC morning, 14 ahead from 10:00 UTC on (so the check can fail at any hour).
    const zone = createdAt.getUTCHours() < 12 ? 'Etc/GMT+12' : 'Pacific/Kiritimati';
    expect(calendarDateIn(createdAt, zone)).not.toBe(createdAt.toISOString().slice(0, 10));
    await db.ds.query(`UPDATE clubs SET time_zone = $2 WHERE id = $1`, [fx.clubId, zone]);
    try {
      const page = (await verify(code).expect(200)).body.checkRun;
      expect(page).toMatchObject({ checkedOn: calendarDateIn(createdAt, zone), timeZone: zone });
      const pdf = await fx.who.builder.agent.get(`/api/check-runs/${runId}/report.pdf`).buffer(true)
        .parse((res, done) => {
          // The body as bytes (supertest buffers only text by default).
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () => done(null, Buffer.concat(chunks)));
        })
        .expect(200);
      expect(pdfText(pdf.body as Buffer)).toContain(`pre-check made on ${page.checkedOn}`);
    } finally {
      await db.ds.query(`UPDATE clubs SET time_zone = $2 WHERE id = $1`, [fx.clubId, was]);
    }
  });

  it('an older 24-character check-run code still verifies, typed as printed or in groups', async () => {
    const legacy = 'Q4M7ZT2KX9B3HDN0PRWC5V8E';
    await legacyCopyOf(runId, legacy);
    const res = await verify(legacy).expect(200);
    expect(res.body.kind).toBe('check_run');
    expect(res.body.checkRun.verdict).toBe('fail');
    expect((await verify('q4m7-zt2k-x9b3-hdno-prwc-5v8e').expect(200)).body.kind).toBe('check_run');
    await verify(`${legacy.slice(0, -1)}${legacy.endsWith('0') ? '1' : '0'}`).expect(404).expect(hasErrorBody(notFound));
  });

  it('a steward of the club, and the builder, look a check run up by its code (current or older form); others get 404', async () => {
    const byCode = (who: typeof fx.who.steward, c: string) => who.agent.get(`/api/check-runs/by-code/${encodeURIComponent(c)}`);
    const steward = await byCode(fx.who.steward, code.toLowerCase()).expect(200);
    expect(steward.body.checkRun).toMatchObject({ id: runId, verificationCode: code, overallVerdict: 'fail' });
    expect((await byCode(fx.who.builder, code).expect(200)).body.checkRun.id).toBe(runId);
    const legacyId = await legacyCopyOf(runId, 'M2K8ZQ4TX7B9HDN3PRWC5V0E');
    expect((await byCode(fx.who.steward, 'M2K8-ZQ4T-X7B9-HDN3-PRWC-5V0E').expect(200)).body.checkRun.id).toBe(legacyId);
    const refused = { error: { code: 'not_found', message: 'No check run you may see has this code.' } };
    await byCode(fx.who.foreignSteward, code).expect(404).expect(hasErrorBody(refused));
    await byCode(fx.who.steward, newVerificationCode(randomBytes(CODE_RANDOM_BYTES))).expect(404).expect(hasErrorBody(refused));
    await byCode(fx.who.steward, 'hello').expect(404).expect(hasErrorBody(refused));
    await request(app).get(`/api/check-runs/by-code/${code}`).expect(401);
  });
});
