// The club's records page, track inspections and the expiry reminder, through the API: stewards and
// admins search the club's records by record number, car and race number, page through them, see
// valid records expiring within 30 days flagged (at 29 and 30 days, not at 31, on a fixed clock);
// builders and other clubs are refused. A steward records inspections (seal number, wall readings
// against the rulebook's minimum) as a history on the record, and a bad reading is refused at its path
// with nothing stored. Builders are mailed once, 30 days ahead, however often the job runs. The
// public check shows the record number, club, make, model and expiry, and still no people or photos.
import { execFileSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { EXPIRY_NOTICE_DAYS } from '../../backend/src/contracts/record-words';
import { createLogger } from '../../backend/src/logger';
import { createServices } from '../../backend/src/services';
import { createJobs } from '../../backend/src/services/jobs';
import { expiryReminderCron, expiryReminderQueue, registerExpiryReminders } from '../../backend/src/services/records/expiry-reminder-job';
import { calendarDateIn, formatIsoDate } from '../../backend/src/domain/dates';
import { agentFor, errorOf, makeTestApp, testConfig, testPublicUrl, useTestDatabase } from './helpers';
import { as, type SignedIn } from './garage-fixtures';
import { act, reviewFixture, submitNew, type ReviewFixture } from './review-fixtures';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;
const DAY = 86_400_000;

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await reviewFixture(db.ds, app);
});

interface Approved {
  submissionId: string;
  carId: string;
  record: { id: string; number: string; verificationCode: string };
}

async function approved(car: { name?: string; make?: string; model?: string; raceNumber?: string } = {}): Promise<Approved> {
  const { builder, steward } = fx.who;
  const sub = await submitNew(builder, fx);
  if (Object.keys(car).length)
    await builder.agent.patch(`/api/cars/${sub.carId}`).set('X-CSRF-Token', builder.token).send(car).expect(200);
  await act(steward, sub.submissionId, { type: 'claim' });
  const res = await act(steward, sub.submissionId, { type: 'approve' });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return { submissionId: sub.submissionId, carId: sub.carId, record: res.body.submission.record };
}

const list = (who: SignedIn, query: Record<string, string | number> = {}, clubId = fx.clubId) =>
  who.agent.get(`/api/clubs/${clubId}/cage-records`).query(query);
const inspect = (who: SignedIn, recordId: string, body: object) =>
  who.agent.post(`/api/cage-records/${recordId}/inspections`).set('X-CSRF-Token', who.token).send(body);
const inspectionCount = async (recordId: string) =>
  Number((await db.ds.query(`SELECT count(*) AS n FROM cage_record_inspections WHERE record_id = $1`, [recordId]))[0].n);

describe('the records page', () => {
  let a: Approved;
  let b: Approved;
  beforeAll(async () => {
    a = await approved({ name: 'Blue Hatch', make: 'Orlen', model: 'Sprite', raceNumber: '212' });
    b = await approved({ name: 'Red Coupe', make: 'Varden', model: 'Kestrel', raceNumber: '9' });
  });

  it('finds a record by its number, the car’s name, make and model, and the race number', async () => {
    const { steward } = fx.who;
    const numbers = async (q: string) => (await list(steward, { q }).expect(200)).body.items.map((i: { number: string }) => i.number);
    expect(await numbers(a.record.number)).toEqual([a.record.number]);
    expect(await numbers(a.record.number.slice(-4).toLowerCase())).toContain(a.record.number);
    expect(await numbers('blue hatch')).toEqual([a.record.number]);
    expect(await numbers('Varden Kestrel')).toEqual([b.record.number]);
    expect(await numbers('kestrel')).toEqual([b.record.number]);
    // A race number matches whole: "9" is car 9, not every number with a 9 in it.
    expect(await numbers('9')).toEqual([b.record.number]);
    expect(await numbers('No. 212')).toEqual([a.record.number]);
    expect(await numbers('#212')).toEqual([a.record.number]);
    expect(await numbers('21')).toEqual([]);
    // LIKE's own characters are plain text.
    expect(await numbers('%')).toEqual([]);
    const found = (await list(steward, { q: '212' }).expect(200)).body.items[0];
    expect(found).toMatchObject({
      id: a.record.id, status: 'valid', expiringSoon: false, car: { id: a.carId, name: 'Blue Hatch', make: 'Orlen', model: 'Sprite', raceNumber: '212' },
      className: expect.any(String), lastInspection: null,
    });
    expect(found.daysLeft).toBeGreaterThan(300);
  });

  it('pages newest first and says how many there are; an empty search finds nothing', async () => {
    const { admin } = fx.who;
    const all = (await list(admin, { pageSize: 100 }).expect(200)).body;
    expect(all.total).toBeGreaterThanOrEqual(2);
    expect(all.items[0].number).toBe(b.record.number);
    const page2 = (await list(admin, { pageSize: 1, page: 2 }).expect(200)).body;
    expect(page2).toMatchObject({ page: 2, pageSize: 1, total: all.total });
    expect(page2.items.map((i: { id: string }) => i.id)).toEqual([all.items[1].id]);
    const none = (await list(admin, { q: 'no such car anywhere' }).expect(200)).body;
    expect(none).toMatchObject({ items: [], total: 0 });
    expect(none.counts.valid).toBe(all.counts.valid);
  });

  it('filters by status; a revoked record is revoked, never expiring', async () => {
    const { steward } = fx.who;
    const c = await approved({ name: 'Green Estate', raceNumber: '88' });
    await steward.agent.post(`/api/cage-records/${c.record.id}/revoke`).set('X-CSRF-Token', steward.token).send({ reason: 'Main hoop cut and rewelded.' }).expect(200);
    const revoked = (await list(steward, { status: 'revoked' }).expect(200)).body.items.map((i: { id: string }) => i.id);
    expect(revoked).toContain(c.record.id);
    expect((await list(steward, { status: 'valid' }).expect(200)).body.items.map((i: { id: string }) => i.id)).not.toContain(c.record.id);
    expect((await list(steward, { q: '88' }).expect(200)).body.items[0]).toMatchObject({ status: 'revoked', expiringSoon: false });
  });

  it('refuses builders (403), other clubs (404), the signed-out (401) and a bad query (400)', async () => {
    const { builder, foreignSteward, outsider } = fx.who;
    await list(builder).expect(403);
    await list(foreignSteward).expect(404);
    await list(outsider).expect(404);
    await agentFor(app).get(`/api/clubs/${fx.clubId}/cage-records`).expect(401);
    const bad = await list(fx.who.steward, { status: 'soon', pageSize: 500 }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['query.pageSize', 'query.status']);
  });
});

describe('the 30-day flag, on a fixed clock', () => {
  it('flags a valid record at 29 and 30 days before it expires, not at 31', async () => {
    const T = new Date(Date.now() + 2 * DAY);
    const services = createServices(db.ds, { publicUrl: testPublicUrl, now: () => T });
    const fixed = makeTestApp(db.ds, { services });
    const steward = await as(fixed, 'steward@tarnwick.example');
    const at = async (days: number, extraMs = 0) => {
      const r = await approved({ raceNumber: `F${days}${extraMs ? 'x' : ''}` });
      await db.ds.query(`UPDATE cage_records SET expires_at = $2 WHERE id = $1`, [r.record.id, new Date(T.getTime() + days * DAY + extraMs)]);
      return r;
    };
    const r29 = await at(29);
    const r30 = await at(30);
    const r30plus = await at(30, 1);
    const r31 = await at(31);
    const flag = async (r: Approved) => {
      const items = (await list(steward, { q: r.record.number }).expect(200)).body.items;
      return { soon: items[0].expiringSoon, days: items[0].daysLeft };
    };
    expect(EXPIRY_NOTICE_DAYS).toBe(30);
    expect(await flag(r29)).toEqual({ soon: true, days: 29 });
    expect(await flag(r30)).toEqual({ soon: true, days: 30 });
    expect(await flag(r30plus)).toEqual({ soon: false, days: 30 });
    expect(await flag(r31)).toEqual({ soon: false, days: 31 });
    const soon = (await list(steward, { status: 'expiring_soon', pageSize: 100 }).expect(200)).body;
    const ids = soon.items.map((i: { id: string }) => i.id);
    expect(ids).toEqual(expect.arrayContaining([r29.record.id, r30.record.id]));
    expect(ids).not.toContain(r31.record.id);
    expect(ids).not.toContain(r30plus.record.id);
    expect(soon.counts.expiring_soon).toBe(soon.total);
  });
});

describe('track inspections', () => {
  let rec: Approved;
  beforeAll(async () => {
    rec = await approved({ raceNumber: '314' });
    // Issued two days ago, so an inspection an hour ago is after it.
    await db.ds.query(`UPDATE cage_records SET issued_at = issued_at - interval '2 days' WHERE id = $1`, [rec.record.id]);
  });

  it('lists the approved sheet’s members with the rulebook’s least wall', async () => {
    const res = await fx.who.steward.agent.get(`/api/cage-records/${rec.record.id}/inspections`).expect(200);
    expect(res.body.inspections).toEqual([]);
    expect(res.body.canRecord).toBe(true);
    const mh = res.body.members.find((m: { id: string }) => m.id === 'mh');
    // F-SCCA-T3 (the demo rulebook's table follows it): 2,201–3,000 lb asks 1.750 × 0.095 in, 0.095 in = 2.413 mm (F-UNIT-1).
    expect(mh).toMatchObject({ name: 'main hoop', wallMm: expect.closeTo(2.413, 3) });
    expect(mh.minWallMm).toBeGreaterThan(2);
    expect(mh.minWallMm).toBeLessThanOrEqual(2.413 + 1e-9);
    expect(res.body.members.map((m: { name: string }) => m.name)).toContain('rear brace (backstay) 2');
  });

  it('records an inspection with seal number and readings; a reading under the minimum is flagged; history newest first', async () => {
    const { steward, admin, builder } = fx.who;
    const first = await inspect(steward, rec.record.id, {
      inspectedAt: new Date(Date.now() - 3600_000).toISOString(), sealNumber: ' TV-S-0417 ',
      readings: [{ memberId: 'mh', wallMm: 2.45 }, { memberId: 'db1', wallMm: 1.2 }], note: 'Sonic gauge, two points per tube.',
    });
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    const one = first.body.inspections[0];
    expect(one).toMatchObject({ sealNumber: 'TV-S-0417', steward: { displayName: 'Imogen Feld' }, note: 'Sonic gauge, two points per tube.' });
    expect(one.readings).toEqual([
      expect.objectContaining({ memberId: 'mh', memberName: 'main hoop', wallMm: 2.45, belowMinimum: false }),
      expect.objectContaining({ memberId: 'db1', wallMm: 1.2, belowMinimum: true }),
    ]);
    const second = await inspect(admin, rec.record.id, { sealNumber: 'TV-S-0502', readings: [] }).expect(201);
    expect(second.body.inspections.map((i: { sealNumber: string }) => i.sealNumber)).toEqual(['TV-S-0502', 'TV-S-0417']);
    // The builder reads the history of their own car, and may not add to it.
    const seen = await builder.agent.get(`/api/cage-records/${rec.record.id}/inspections`).expect(200);
    expect(seen.body).toMatchObject({ canRecord: false });
    expect(seen.body.inspections).toHaveLength(2);
    // The list shows the latest.
    const row = (await list(steward, { q: '314' }).expect(200)).body.items[0];
    expect(row.lastInspection).toMatchObject({ sealNumber: 'TV-S-0502' });
    // The activity log says it in a sentence's facts.
    const audit: { actor_id: string; details: Record<string, unknown> }[] = await db.ds.query(
      `SELECT actor_id, details FROM audit_entries WHERE action = 'cage_record.inspected' AND entity_id = $1 ORDER BY created_at`, [rec.record.id]);
    expect(audit).toHaveLength(2);
    expect(audit[0]!.details).toMatchObject({ number: rec.record.number, sealNumber: 'TV-S-0417', readings: 2, belowMinimum: 1, carId: rec.carId });
  });

  it('refuses bad readings at their paths and stores nothing', async () => {
    const { steward } = fx.who;
    const before = await inspectionCount(rec.record.id);
    const auditBefore = Number((await db.ds.query(`SELECT count(*) AS n FROM audit_entries WHERE action = 'cage_record.inspected' AND entity_id = $1`, [rec.record.id]))[0].n);
    const res = await inspect(steward, rec.record.id, {
      sealNumber: 'TV-S-0600',
      readings: [
        { memberId: 'mh', wallMm: 2.4 },
        { memberId: 'fh', wallMm: 0.095 }, // inches typed as millimetres
        { memberId: 'nope', wallMm: 2.4 },
        { memberId: 'mh', wallMm: 2.5 },
        { memberId: 'dg', wallMm: 24.1 },
      ],
    }).expect(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(['readings.1.wallMm', 'readings.2.memberId', 'readings.3.memberId', 'readings.4.wallMm']);
    expect(res.body.error.details[0].message).toMatch(/measured wall is 0\.3 to 10 mm/i);
    await inspect(steward, rec.record.id, { sealNumber: '   ', readings: [] }).expect(400)
      .expect((r) => expect(r.body.error.details.map((d: { path: string }) => d.path)).toEqual(['sealNumber']));
    await inspect(steward, rec.record.id, { sealNumber: 'X1', readings: [{ memberId: 'mh', wallMm: 'two' }] }).expect(400)
      .expect((r) => expect(r.body.error.details.map((d: { path: string }) => d.path)).toEqual(['readings.0.wallMm']));
    await inspect(steward, rec.record.id, { sealNumber: 'X1', inspectedAt: new Date(Date.now() + 86_400_000).toISOString() }).expect(400)
      .expect((r) => expect(r.body.error).toEqual(errorOf({ code: 'validation_failed', message: 'An inspection cannot be in the future.', details: [{ path: 'inspectedAt', message: 'An inspection cannot be in the future.' }] })));
    await inspect(steward, rec.record.id, { sealNumber: 'X1', inspectedAt: '2001-01-01T00:00:00Z' }).expect(400);
    expect(await inspectionCount(rec.record.id)).toBe(before);
    const auditAfter = Number((await db.ds.query(`SELECT count(*) AS n FROM audit_entries WHERE action = 'cage_record.inspected' AND entity_id = $1`, [rec.record.id]))[0].n);
    expect(auditAfter).toBe(auditBefore);
  });

  it('refuses the car’s owner (403), other builders and other clubs (404), and a record that is not valid (409)', async () => {
    const { builder, otherBuilder, foreignSteward, steward } = fx.who;
    const before = await inspectionCount(rec.record.id);
    await inspect(builder, rec.record.id, { sealNumber: 'X2' }).expect(403);
    await inspect(otherBuilder, rec.record.id, { sealNumber: 'X2' }).expect(404);
    await inspect(foreignSteward, rec.record.id, { sealNumber: 'X2' }).expect(404);
    await otherBuilder.agent.get(`/api/cage-records/${rec.record.id}/inspections`).expect(404);
    expect(await inspectionCount(rec.record.id)).toBe(before);
    const gone = await approved();
    await steward.agent.post(`/api/cage-records/${gone.record.id}/revoke`).set('X-CSRF-Token', steward.token).send({ reason: 'Crash damage to the main hoop.' }).expect(200);
    const refused = await inspect(steward, gone.record.id, { sealNumber: 'X3' }).expect(409);
    expect(refused.body.error.details).toEqual({ reason: 'record_revoked' });
    expect((await steward.agent.get(`/api/cage-records/${gone.record.id}/inspections`).expect(200)).body.canRecord).toBe(false);
  });

  it('refuses a steward inspecting their own car (403)', async () => {
    // The demo admin is also a steward; give them a car of their own with a record.
    const { admin } = fx.who;
    const r = await approved();
    const adminId = (await db.ds.query(`SELECT id FROM users WHERE email = 'admin@tarnwick.example'`))[0].id;
    await db.ds.query(`UPDATE cars SET owner_id = $2 WHERE id = $1`, [r.carId, adminId]);
    const res = await inspect(admin, r.record.id, { sealNumber: 'X4' }).expect(403);
    expect(res.body.error.message).toMatch(/never of their own car/);
  });
});

describe('the public check', () => {
  it('shows the record number, club, make, model, expiry and the latest seal, and no people or photos', async () => {
    const { steward } = fx.who;
    const r = await approved({ name: 'Silver Saloon', make: 'Orlen', model: 'Vantor', raceNumber: '71' });
    await inspect(steward, r.record.id, { sealNumber: 'TV-S-0711', readings: [{ memberId: 'mh', wallMm: 2.41 }] }).expect(201);
    const anon = agentFor(app);
    const res = await anon.get(`/api/verify/${r.record.verificationCode}`).expect(200);
    const rec = (await steward.agent.get(`/api/cage-records/${r.record.id}`).expect(200)).body.record;
    expect(res.body).toEqual({
      kind: 'cage_record',
      record: {
        recordNumber: r.record.number, clubName: 'Tarnwick Vale Motor Club', carName: 'Silver Saloon', make: 'Orlen', model: 'Vantor', raceNumber: '71',
        className: expect.any(String), rulebookTitle: expect.any(String), edition: expect.any(String), status: 'valid',
        expiresAt: rec.expiresAt, expiresOn: calendarDateIn(new Date(rec.expiresAt), 'Europe/London'),
        lastInspection: { inspectedOn: calendarDateIn(new Date(), 'Europe/London'), sealNumber: 'TV-S-0711' },
      },
    });
    const text = JSON.stringify(res.body).toLowerCase();
    const people: { email: string; display_name: string }[] = await db.ds.query(`SELECT email, display_name FROM users`);
    for (const p of people) {
      expect(text).not.toContain(p.email.toLowerCase());
      expect(text).not.toContain(p.display_name.toLowerCase());
    }
    expect(text).not.toMatch(/photo|steward|builder|owner|\.jpe?g|uploads/);
  });

  it('says one expiry date everywhere, the club’s: a record ending at 14:00 UTC is valid until the next day in Auckland', async () => {
    const { steward, builder } = fx.who;
    const r = await approved({ name: 'Antipodes Coupe' });
    const [{ time_zone: was }] = await db.ds.query(`SELECT time_zone FROM clubs WHERE id = $1`, [fx.clubId]);
    // Pacific/Auckland is UTC+13 in December (its summer time): 14:00 UTC on 2 Dec 2027 is 03:00 on 3 Dec there.
    await db.ds.query(`UPDATE cage_records SET expires_at = '2027-12-02T14:00:00Z' WHERE id = $1`, [r.record.id]);
    await db.ds.query(`UPDATE clubs SET time_zone = 'Pacific/Auckland' WHERE id = $1`, [fx.clubId]);
    try {
      const verify = (await agentFor(app).get(`/api/verify/${r.record.verificationCode}`).expect(200)).body.record;
      const view = (await steward.agent.get(`/api/cage-records/${r.record.id}`).expect(200)).body.record;
      const listed = (await list(steward, { q: r.record.number }).expect(200)).body.items[0];
      const cars = (await builder.agent.get('/api/cars').expect(200)).body.cars as { id: string; buildSheets: { review: { record: { expiresOn: string } | null } | null }[] }[];
      const garage = cars.find((c) => c.id === r.carId)!.buildSheets[0]!.review!.record!;
      expect([verify.expiresOn, view.expiresOn, listed.expiresOn, garage.expiresOn]).toEqual(['2027-12-03', '2027-12-03', '2027-12-03', '2027-12-03']);
      // The instant itself is unchanged.
      expect(view.expiresAt).toBe('2027-12-02T14:00:00.000Z');
      // The club back in London: the same instant is 2 Dec there.
      await db.ds.query(`UPDATE clubs SET time_zone = 'Europe/London' WHERE id = $1`, [fx.clubId]);
      expect((await agentFor(app).get(`/api/verify/${r.record.verificationCode}`).expect(200)).body.record.expiresOn).toBe('2027-12-02');
    } finally {
      await db.ds.query(`UPDATE clubs SET time_zone = $2 WHERE id = $1`, [fx.clubId, was]);
    }
  });
});

describe('the expiry reminder', () => {
  it('mails each builder once, 30 days ahead, on re-runs and on two servers at once', async () => {
    const T = new Date(Date.now() + 5 * DAY);
    const { recordBook } = createServices(db.ds, { publicUrl: testPublicUrl, now: () => T });
    const second = createServices(db.ds, { publicUrl: testPublicUrl, now: () => T }).recordBook;
    const set = async (r: Approved, days: number) => db.ds.query(`UPDATE cage_records SET expires_at = $2 WHERE id = $1`, [r.record.id, new Date(T.getTime() + days * DAY)]);
    const due = await approved({ name: 'Due Car' });
    const edge = await approved({ name: 'Edge Car' });
    const later = await approved({ name: 'Later Car' });
    const revoked = await approved({ name: 'Revoked Car' });
    await set(due, 12);
    await set(edge, 30);
    await set(later, 31);
    await set(revoked, 10);
    await fx.who.steward.agent.post(`/api/cage-records/${revoked.record.id}/revoke`).set('X-CSRF-Token', fx.who.steward.token).send({ reason: 'Crash damage, hoop bent.' }).expect(200);
    // Everything else in the test database is far from expiry or already reminded: run once to settle it.
    const firstRound = await Promise.all([recordBook.remindExpiring(T), second.remindExpiring(T)]);
    const reminded = firstRound.flat();
    expect(reminded).toEqual(expect.arrayContaining([due.record.number, edge.record.number]));
    expect(reminded).not.toContain(later.record.number);
    expect(reminded).not.toContain(revoked.record.number);
    expect(new Set(reminded).size).toBe(reminded.length);
    // A re-run the same hour, and one a day later, mail nobody again.
    expect(await recordBook.remindExpiring(T)).toEqual([]);
    const dayLater = new Date(T.getTime() + DAY);
    expect(await recordBook.remindExpiring(dayLater)).toEqual([later.record.number]);
    expect(await second.remindExpiring(dayLater)).toEqual([]);
    const mails: { to_address: string; subject: string; text_body: string; idempotency_key: string; record_id: string }[] = await db.ds.query(
      `SELECT to_address, subject, text_body, idempotency_key, related->>'recordId' AS record_id FROM outbox_messages
       WHERE kind = 'cage_record.expiring' AND related->>'recordId' = ANY($1::text[])`,
      [[due, edge, later, revoked].map((r) => r.record.id)],
    );
    expect(mails.map((m) => m.record_id).sort()).toEqual([due, edge, later].map((r) => r.record.id).sort());
    const dueMail = mails.find((m) => m.record_id === due.record.id)!;
    expect(dueMail).toMatchObject({ to_address: 'builder@tarnwick.example', idempotency_key: `cage_record.expiring:${due.record.id}` });
    expect(dueMail.subject).toBe(`Cage record ${due.record.number} expires on ${formatIsoDate(calendarDateIn(new Date(T.getTime() + 12 * DAY), 'Europe/London'))}`);
    expect(dueMail.text_body).toContain('in 12 days');
    expect(dueMail.text_body).toContain(`${testPublicUrl}/cage-records/${due.record.id}`);
    const marks = await db.ds.query(`SELECT id, expiry_reminded_at FROM cage_records WHERE id = $1`, [due.record.id]);
    expect(new Date(marks[0].expiry_reminded_at).toISOString()).toBe(T.toISOString());
  });
});

describe('the record’s PDF', () => {
  it('lists the track inspections with their seal, steward and readings', async () => {
    const { steward } = fx.who;
    const r = await approved({ raceNumber: '515' });
    await inspect(steward, r.record.id, { sealNumber: 'TV-S-0515', readings: [{ memberId: 'mh', wallMm: 2.45 }, { memberId: 'fh', wallMm: 1.3 }] }).expect(201);
    const res = await steward.agent.get(`/api/submissions/${r.submissionId}/report.pdf?units=metric`).buffer(true).parse((response, done) => {
      const chunks: Buffer[] = [];
      response.on('data', (c: Buffer) => chunks.push(c));
      response.on('end', () => done(null, Buffer.concat(chunks)));
    }).expect(200);
    const dir = await mkdtemp(join(tmpdir(), 'cw-inspect-'));
    const file = join(dir, 'record.pdf');
    await writeFile(file, res.body as Buffer);
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('seal TV-S-0515, by Imogen Feld');
    expect(text).toContain("1 reading under the rulebook's minimum");
    expect(text).toMatch(/main hoop 2\.45 mm/);
    expect(text).toMatch(/front hoop 1\.30? mm \(under\)/);
    mkdirSync(join(process.cwd(), '.artifacts/screens'), { recursive: true });
    execFileSync('pdftoppm', ['-png', '-r', '60', file, join(process.cwd(), '.artifacts/screens/records-pdf')]);
  });
});

describe('the expiry reminder job', () => {
  it('runs on pg-boss: a job on the queue reminds the due records and completes; the schedule is registered', async () => {
    const T = new Date(Date.now() + 9 * DAY);
    const { recordBook } = createServices(db.ds, { publicUrl: testPublicUrl, now: () => T });
    const jobs = createJobs(testConfig(), createLogger('silent'), { pollingIntervalSeconds: 0.5 });
    await jobs.start();
    try {
      await registerExpiryReminders(jobs, { recordBook, now: () => T });
      const schedules: { name: string; cron: string }[] = await db.ds.query(`SELECT name, cron FROM pgboss.schedule WHERE name = $1`, [expiryReminderQueue]);
      expect(schedules).toEqual([{ name: expiryReminderQueue, cron: expiryReminderCron }]);
      const due = await approved({ name: 'Job Car' });
      await db.ds.query(`UPDATE cage_records SET expires_at = $2 WHERE id = $1`, [due.record.id, new Date(T.getTime() + 20 * DAY)]);
      const jobId = await jobs.send(expiryReminderQueue, {});
      const deadline = Date.now() + 20_000;
      for (;;) {
        const p = await jobs.getProgress(jobId);
        if (p?.state === 'completed') break;
        if (p?.state === 'failed' || Date.now() > deadline) throw new Error(`reminder job ${p?.state ?? 'missing'}: ${p?.error ?? ''}`);
        await new Promise((r) => setTimeout(r, 100));
      }
      const mark = await db.ds.query(`SELECT expiry_reminded_at FROM cage_records WHERE id = $1`, [due.record.id]);
      expect(new Date(mark[0].expiry_reminded_at).toISOString()).toBe(T.toISOString());
      // The same round again (a retry, the next hour): no second mail.
      await jobs.send(expiryReminderQueue, {});
      await new Promise((r) => setTimeout(r, 1500));
      const mails = await db.ds.query(`SELECT count(*)::int AS n FROM outbox_messages WHERE kind = 'cage_record.expiring' AND related->>'recordId' = $1`, [due.record.id]);
      expect(mails[0].n).toBe(1);
    } finally {
      await jobs.stop();
    }
  }, 60_000);
});
