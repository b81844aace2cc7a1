// The activity log in words (issue 13 §4): every entry comes with the things it names resolved (person,
// car, sheet, record, edition) and whether the reader can open each; review decisions are logged in the
// decision's transaction with the car, sheet and record named; older entries without names are resolved
// by joins; the log filters by car and by person; an invitation is e-mailed through the outbox and the
// log reads what the outbox did with it.
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import type { AuditEntryWire, AuditPageWire } from '../../backend/src/contracts/audit';
import { createLogger } from '../../backend/src/logger';
import { startOutboxDispatcher, type MailTransport } from '../../backend/src/services/mail';
import type { SignedIn } from './garage-fixtures';
import { makeTestApp, useTestDatabase } from './helpers';
import { act, reviewFixture, submitNew, type ReviewFixture, type Submitted } from './review-fixtures';

const db = useTestDatabase();
let app: Express;
let fx: ReviewFixture;
let first: Submitted;
let second: Submitted;
let recordNumber: string;
let recordId: string;

async function log(query = '', who: SignedIn = fx.who.admin): Promise<AuditPageWire> {
  const res = await who.agent.get(`/api/clubs/${fx.clubId}/audit${query}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as AuditPageWire;
}
const only = (page: AuditPageWire, action: string): AuditEntryWire[] => page.entries.filter((e) => e.action === action);
const userId = async (email: string) => ((await db.ds.query('SELECT id FROM users WHERE email = $1', [email])) as { id: string }[])[0]!.id;

beforeAll(async () => {
  await db.ds.query('TRUNCATE audit_entries');
  app = makeTestApp(db.ds);
  fx = await reviewFixture(db.ds, app);
  first = await submitNew(fx.who.builder, fx);
  expect((await act(fx.who.steward, first.submissionId, { type: 'claim' })).status).toBe(200);
  expect((await act(fx.who.steward, first.submissionId, { type: 'approve', note: 'Neat welds.' })).status).toBe(200);
  const [record] = (await db.ds.query('SELECT id, number FROM cage_records WHERE submission_id = $1', [first.submissionId])) as { id: string; number: string }[];
  recordNumber = record!.number;
  recordId = record!.id;
  second = await submitNew(fx.who.otherBuilder, fx);
});

describe('entries name what they are about', () => {
  it('an approval names the car, the sheet and the record it issued, written in its own transaction', async () => {
    const [approve] = only(await log(), 'submission.approve');
    expect(approve).toMatchObject({
      actor: { email: 'steward@tarnwick.example', displayName: 'Imogen Feld', open: true },
      details: { from: 'in_review', to: 'approved', note: 'Neat welds.', carId: first.carId, carName: 'Grey Saloon', sheetId: first.sheetId, sheetName: 'Full cage 2027', recordId, recordNumber },
      subjects: {
        // Only a car's owner opens its page; an admin reads the car's entries in the log instead.
        car: { id: first.carId, name: 'Grey Saloon', open: false },
        sheet: { id: first.sheetId, name: 'Full cage 2027', open: true },
        record: { id: recordId, name: recordNumber, open: true },
        submission: { id: first.submissionId, open: true },
      },
    });
    const [issued] = only(await log(), 'cage_record.issued');
    expect(issued!.subjects).toMatchObject({ record: { id: recordId, name: recordNumber }, car: { id: first.carId, name: 'Grey Saloon' } });
  });

  it('every review decision is logged: asking for changes and rejecting too', async () => {
    const s = await submitNew(fx.who.builder, fx);
    await act(fx.who.steward, s.submissionId, { type: 'claim' });
    expect((await act(fx.who.steward, s.submissionId, { type: 'request_changes', note: 'Door bar wall under the table.' })).status).toBe(200);
    const t = await submitNew(fx.who.otherBuilder, fx);
    await act(fx.who.steward, t.submissionId, { type: 'claim' });
    expect((await act(fx.who.steward, t.submissionId, { type: 'reject', reason: 'Not this cage design.' })).status).toBe(200);
    const page = await log('?pageSize=100');
    expect(only(page, 'submission.request_changes').map((e) => [e.details.note, e.subjects.car?.id])).toEqual([['Door bar wall under the table.', s.carId]]);
    expect(only(page, 'submission.reject').map((e) => [e.details.note, e.subjects.car?.id])).toEqual([['Not this cage design.', t.carId]]);
    // The submission and the builder's submit entry are both there.
    expect(only(page, 'submission.submit').map((e) => e.subjects.submission?.id)).toEqual(expect.arrayContaining([s.submissionId, t.submissionId, first.submissionId]));
  });

  it('an entry written before names were recorded is still resolved, by joins', async () => {
    const stewardId = await userId('steward@tarnwick.example');
    await db.ds.query(
      `INSERT INTO audit_entries (club_id, actor_id, action, entity_type, entity_id, details, created_at)
       VALUES ($1, $2, 'submission.approve', 'submission', $3, '{"from":"in_review","to":"approved"}', now() - interval '1 day')`,
      [fx.clubId, stewardId, first.submissionId],
    );
    const old = only(await log('?pageSize=100'), 'submission.approve').find((e) => !('carName' in e.details))!;
    expect(old.subjects).toMatchObject({
      car: { id: first.carId, name: 'Grey Saloon' },
      sheet: { id: first.sheetId, name: 'Full cage 2027' },
      record: { id: recordId, name: recordNumber },
    });
  });

  it('a deleted draft keeps its name from the details, and cannot be opened', async () => {
    const draft = await fx.who.admin.agent.post(`/api/rulebooks/${fx.rulebookId}/drafts`).set('X-CSRF-Token', fx.who.admin.token).expect(201);
    await fx.who.admin.agent.delete(`/api/ruleset-drafts/${draft.body.version.id}`).set('X-CSRF-Token', fx.who.admin.token).expect(204);
    const page = await log();
    const [started] = only(page, 'ruleset.draft_started');
    const [deleted] = only(page, 'ruleset.draft_deleted');
    const title = ((await db.ds.query('SELECT title FROM rulebooks WHERE id = $1', [fx.rulebookId])) as { title: string }[])[0]!.title;
    const n = draft.body.version.versionNumber as number;
    expect(deleted!.subjects.edition).toEqual({ id: draft.body.version.id, name: `${title}, version ${n} (edition ${draft.body.version.edition})`, open: false });
    expect(started!.subjects.edition).toMatchObject({ id: draft.body.version.id, open: false });
  });
});

describe('filtering by car and by person', () => {
  it('by car: only the entries about that car', async () => {
    const page = await log(`?carId=${first.carId}&pageSize=100`);
    expect(page.total).toBeGreaterThan(0);
    expect(page.entries.every((e) => e.subjects.car?.id === first.carId)).toBe(true);
    expect(new Set(page.entries.map((e) => e.action))).toEqual(new Set(['submission.submit', 'submission.claim', 'submission.approve', 'cage_record.issued']));
    expect((await log(`?carId=${second.carId}`)).entries.map((e) => e.action)).toEqual(['submission.submit']);
  });

  it('by person: what they did and what was done about them', async () => {
    const builderId = await userId('builder@tarnwick.example');
    const page = await log(`?personId=${builderId}&pageSize=100`);
    // The steward's approval is about the builder's submission, so it is listed too.
    expect(page.entries.some((e) => e.action === 'submission.approve' && e.actor?.email === 'steward@tarnwick.example')).toBe(true);
    expect(page.entries.every((e) => e.subjects.car?.id !== second.carId)).toBe(true);
    const other = await log(`?personId=${await userId('builder2@tarnwick.example')}&pageSize=100`);
    expect(other.entries.every((e) => e.actor?.email === 'builder2@tarnwick.example' || e.action.startsWith('submission.'))).toBe(true);
    expect(other.entries.map((e) => e.subjects.car?.id)).toContain(second.carId);
  });

  it('combines filters, and an unknown car matches nothing', async () => {
    const both = await log(`?carId=${first.carId}&action=submission.approve`);
    expect(both.entries.map((e) => e.action)).toEqual(['submission.approve', 'submission.approve']);
    expect(await log('?carId=00000000-0000-4000-8000-000000000000')).toMatchObject({ entries: [], total: 0 });
  });

  it('lists the club’s cars and people for the filters', async () => {
    const page = await log();
    expect(page.cars).toEqual(expect.arrayContaining([
      { id: first.carId, name: 'Grey Saloon', hint: 'Robin Ashcombe' },
      { id: second.carId, name: 'Grey Saloon', hint: 'Sam Okafor' },
    ]));
    expect(page.people).toEqual(expect.arrayContaining([
      { id: await userId('steward@tarnwick.example'), name: 'Imogen Feld', hint: 'steward@tarnwick.example' },
      { id: await userId('builder2@tarnwick.example'), name: 'Sam Okafor', hint: 'builder2@tarnwick.example' },
    ]));
    // Someone in no club and never in this log is not offered.
    expect(page.people.map((p) => p.hint)).not.toContain('nobody@elsewhere.example');
  });

  it('names a bad car or person id at its field', async () => {
    const res = await fx.who.admin.agent.get(`/api/clubs/${fx.clubId}/audit?carId=42&personId=robin`).expect(400);
    expect(res.body.error.details).toEqual([
      { path: 'query.carId', message: 'Must be an id' },
      { path: 'query.personId', message: 'Must be an id' },
    ]);
  });

  it.each(['steward', 'builder'] as const)('refuses a %s with 403', async (role) => {
    const res = await fx.who[role].agent.get(`/api/clubs/${fx.clubId}/audit?carId=${first.carId}`);
    expect(res.status).toBe(403);
  });
});

describe('invitations by e-mail', () => {
  const caught: { to: string; subject: string; text: string }[] = [];
  const transport = (fail: boolean): MailTransport => ({
    async sendMail(m) {
      if (fail) throw new Error('550 mailbox unavailable');
      caught.push({ to: m.to, subject: m.subject, text: m.text });
    },
  });
  const dispatch = async (fail: boolean) => {
    const d = startOutboxDispatcher({
      dataSource: db.ds, transport: transport(fail), from: 'Cagewright <no-reply@cagewright.example>', logger: createLogger('silent'), autoStart: false,
      backoff: { baseMs: 1000, capMs: 1000, maxAttempts: 1 },
    });
    await d.runOnce();
    await d.stop();
  };
  const add = async (email: string, roles = ['builder']) => {
    const res = await fx.who.admin.agent.post(`/api/clubs/${fx.clubId}/members`).set('X-CSRF-Token', fx.who.admin.token).send({ email, roles });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body as { member: { user: { id: string } }; invitationUrl?: string; invitationMailed?: boolean };
  };
  const addedEntry = async (personId: string) => only(await log(`?personId=${personId}`), 'membership.added')[0]!;

  it('queues the invitation e-mail with the link the admin also sees, and the log says so once it went out', async () => {
    await db.ds.query(`UPDATE outbox_messages SET status = 'sent', sent_at = now() WHERE status = 'pending'`);
    const added = await add('wyn.parry@tarnwick.example', ['builder', 'steward']);
    expect(added.invitationUrl).toMatch(/^http:\/\/cagewright\.test\/invitations\/[\w-]{43}$/);
    expect(added.invitationMailed).toBe(true);
    const queued = (await db.ds.query(`SELECT to_address, kind, subject, text_body FROM outbox_messages WHERE to_address = 'wyn.parry@tarnwick.example'`)) as { to_address: string; kind: string; subject: string; text_body: string }[];
    expect(queued).toHaveLength(1);
    expect(queued[0]).toMatchObject({ kind: 'invitation.sent', subject: 'Dara Quill invited you to Tarnwick Vale Motor Club on Cagewright' });
    expect(queued[0]!.text_body).toContain(`Set your password and join: ${added.invitationUrl}`);
    expect(queued[0]!.text_body).toContain('as builder and steward');

    const waiting = await addedEntry(added.member.user.id);
    expect(waiting.details).toMatchObject({ email: 'wyn.parry@tarnwick.example', invited: true, mailId: expect.any(String) });
    // Not joined yet: named by the address, not by the placeholder name of the account waiting for them.
    expect(waiting.subjects).toMatchObject({ person: { id: added.member.user.id, name: 'wyn.parry@tarnwick.example', email: 'wyn.parry@tarnwick.example', open: true }, invitationMail: { status: 'pending', sentAt: null } });

    await dispatch(false);
    expect(caught.map((m) => m.to)).toEqual(['wyn.parry@tarnwick.example']);
    expect((await addedEntry(added.member.user.id)).subjects.invitationMail).toEqual({ status: 'sent', sentAt: expect.any(String) });
  });

  it('says when the e-mail could not be delivered', async () => {
    const added = await add('tamsin.holt@tarnwick.example');
    await dispatch(true);
    expect((await addedEntry(added.member.user.id)).subjects.invitationMail).toEqual({ status: 'failed_permanently', sentAt: null });
  });

  it('mails nobody when the person already has an account: they are added, not invited', async () => {
    const before = ((await db.ds.query('SELECT count(*)::int AS n FROM outbox_messages')) as { n: number }[])[0]!.n;
    const added = await add('nobody@elsewhere.example');
    expect(added.invitationUrl).toBeUndefined();
    expect(added.invitationMailed).toBeUndefined();
    expect(((await db.ds.query('SELECT count(*)::int AS n FROM outbox_messages')) as { n: number }[])[0]!.n).toBe(before);
    const entry = await addedEntry(added.member.user.id);
    expect(entry.details).toEqual({ email: 'nobody@elsewhere.example', roles: ['builder'], invited: false });
    expect(entry.subjects.invitationMail).toBeUndefined();
    expect(entry.subjects.person).toMatchObject({ name: 'Lee Marr', open: true });
  });

  it('a removed member is named but no longer links to the members page', async () => {
    const id = await userId('nobody@elsewhere.example');
    await fx.who.admin.agent.delete(`/api/clubs/${fx.clubId}/members/${id}`).set('X-CSRF-Token', fx.who.admin.token).expect(204);
    const [removed] = only(await log(`?personId=${id}`), 'membership.removed');
    expect(removed!.subjects.person).toEqual({ id, name: 'Lee Marr', email: 'nobody@elsewhere.example', open: false });
  });
});
