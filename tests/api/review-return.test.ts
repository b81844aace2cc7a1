// A resubmission goes back to the steward who asked for the changes (issue 13 §3): it arrives claimed by
// them, in their "assigned to me" queue, and they are mailed; unless they released the request for
// changes first (audited), when it waits for any steward. Another steward cannot release it; an admin can.
// A steward who has lost the role gets nothing back. No decision is sent without its type.
import { beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../backend/src/services/passwords';
import { as, otherPassword, type SignedIn } from './garage-fixtures';
import { errorBody, makeTestApp, useTestDatabase } from './helpers';
import { outboxRows } from './mail-helpers';
import { act, current, failingSpec, passingSpec, reviewFixture, savedRun, submitNew, type ReviewFixture, type Submitted } from './review-fixtures';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;
let secondSteward: SignedIn;
const secondStewardEmail = 'rosa.quill@stewards.example';

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await reviewFixture(db.ds, app);
  const u = await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, 'Rosa Quill', $2) RETURNING id`, [secondStewardEmail, await hashPassword(otherPassword)]);
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{steward}')`, [u[0].id, fx.clubId]);
  secondSteward = await as(app, secondStewardEmail);
});

/** A failing submission the demo steward claimed and asked changes on. */
async function changesAsked(): Promise<Submitted> {
  const s = await submitNew(fx.who.builder, fx, failingSpec());
  expect((await act(fx.who.steward, s.submissionId, { type: 'claim' })).status).toBe(200);
  expect((await act(fx.who.steward, s.submissionId, { type: 'request_changes', note: 'Door bars need the 0.095 in wall.' })).status).toBe(200);
  return s;
}

async function resubmitFixed(s: Submitted) {
  const { builder } = fx.who;
  const rev = await builder.agent.get(`/api/build-sheets/${s.sheetId}`).expect(200);
  await builder.agent.put(`/api/build-sheets/${s.sheetId}/specification`).set('X-CSRF-Token', builder.token)
    .send({ baseRevision: rev.body.buildSheet.currentRevision, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: passingSpec() }).expect(200);
  const runId = await savedRun(builder, s.sheetId);
  const old = await current(builder, s.submissionId);
  const res = await builder.agent.post(`/api/submissions/${s.submissionId}/resubmit`).set('X-CSRF-Token', builder.token)
    .send({ checkRunId: runId, expected: { state: old.state, version: old.version } });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.submission as { id: string; state: string; assignedSteward: { displayName: string } | null; can: Record<string, boolean> };
}

describe('a resubmission comes back to the steward who asked for the changes', () => {
  it('arrives claimed by them, in their queue, with a mail to them and an entry in the log', async () => {
    const s = await changesAsked();
    const before = (await outboxRows(db.ds)).length;
    const next = await resubmitFixed(s);
    expect(next).toMatchObject({ state: 'in_review', assignedSteward: { displayName: 'Imogen Feld' } });
    const mine = await fx.who.steward.agent.get(`/api/clubs/${fx.clubId}/submissions?assigned=me`).expect(200);
    expect(mine.body.items.map((i: { id: string }) => i.id)).toContain(next.id);
    // The steward decides without claiming again; another steward cannot.
    expect((await current(fx.who.steward, next.id)).can).toMatchObject({ decide: true, release: true, claim: false });
    expect((await current(secondSteward, next.id)).can).toMatchObject({ decide: false, release: false, claim: false });
    expect((await act(secondSteward, next.id, { type: 'approve' })).status).toBe(403);
    const mails = (await outboxRows(db.ds)).slice(before);
    expect(mails).toEqual(expect.arrayContaining([expect.objectContaining({ to_address: 'steward@tarnwick.example', subject: 'Back with you for review: Grey Saloon' })]));
    const [entry] = await db.ds.query(`SELECT details FROM audit_entries WHERE action = 'submission.resubmit' AND entity_id = $1`, [next.id]);
    expect(entry.details).toMatchObject({ to: 'in_review', returnedToName: 'Imogen Feld' });
    expect((await act(fx.who.steward, next.id, { type: 'approve' })).status).toBe(200);
  });

  it('the steward releases the request first: the resubmission then waits for any steward', async () => {
    const s = await changesAsked();
    const seen = await current(fx.who.steward, s.submissionId);
    expect(seen.can).toMatchObject({ release: true });
    // Another steward cannot let it go for them; the builder cannot either.
    const other = await act(secondSteward, s.submissionId, { type: 'release' });
    expect(other.status).toBe(403);
    expect(other.body).toEqual(errorBody({ error: { code: 'forbidden', message: 'Only the steward who claimed it (or a club admin) can release it.' } }));
    expect((await act(fx.who.builder, s.submissionId, { type: 'release' })).status).toBe(403);
    const released = await act(fx.who.steward, s.submissionId, { type: 'release', note: 'Away for the next two events.' });
    expect(released.status, JSON.stringify(released.body)).toBe(200);
    expect(released.body.submission).toMatchObject({ state: 'changes_requested', assignedSteward: null, can: { release: false } });
    // Twice is refused plainly.
    const again = await act(fx.who.steward, s.submissionId, { type: 'release' });
    expect(again.status).toBe(409);
    const [entry] = await db.ds.query(`SELECT actor_id, details FROM audit_entries WHERE action = 'submission.release' AND entity_id = $1`, [s.submissionId]);
    expect(entry.details).toMatchObject({ from: 'changes_requested', to: 'changes_requested', note: 'Away for the next two events.', carName: 'Grey Saloon' });
    const next = await resubmitFixed(s);
    expect(next).toMatchObject({ state: 'pending', assignedSteward: null });
    expect((await act(secondSteward, next.id, { type: 'claim' })).status).toBe(200);
  });

  it('an admin may release it for a steward who has gone quiet', async () => {
    const s = await changesAsked();
    expect((await act(fx.who.admin, s.submissionId, { type: 'release' })).status).toBe(200);
    expect((await resubmitFixed(s)).state).toBe('pending');
  });

  it('a steward who no longer holds the role gets nothing back', async () => {
    const s = await submitNew(fx.who.builder, fx, failingSpec());
    await act(secondSteward, s.submissionId, { type: 'claim' });
    expect((await act(secondSteward, s.submissionId, { type: 'request_changes', note: 'Door bars need the 0.095 in wall.' })).status).toBe(200);
    await db.ds.query(`UPDATE memberships SET roles = '{builder}' WHERE user_id = (SELECT id FROM users WHERE email = $1)`, [secondStewardEmail]);
    try {
      expect(await resubmitFixed(s)).toMatchObject({ state: 'pending', assignedSteward: null });
    } finally {
      await db.ds.query(`UPDATE memberships SET roles = '{steward}' WHERE user_id = (SELECT id FROM users WHERE email = $1)`, [secondStewardEmail]);
    }
  });
});

describe('a decision names itself', () => {
  it('an action without a type (no decision chosen) is refused and changes nothing', async () => {
    const s = await submitNew(fx.who.builder, fx);
    await act(fx.who.steward, s.submissionId, { type: 'claim' });
    const seen = await current(fx.who.steward, s.submissionId);
    const res = await fx.who.steward.agent.post(`/api/submissions/${s.submissionId}/actions`).set('X-CSRF-Token', fx.who.steward.token)
      .send({ note: 'Looks fine.', expected: { state: seen.state, version: seen.version } });
    expect(res.status).toBe(400);
    expect(await current(fx.who.steward, s.submissionId)).toMatchObject({ state: 'in_review', version: seen.version });
    expect(await db.ds.query(`SELECT 1 FROM cage_records WHERE submission_id = $1`, [s.submissionId])).toEqual([]);
  });
});
