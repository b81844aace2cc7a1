// Submissions and the review workflow through the API: the builder submits (with photos and a
// note) and withdraws; stewards of the club claim, waive, annotate and decide; other clubs' stewards
// and other people see nothing (404); a builder cannot decide (403); a withdrawn submission cannot
// be approved; two approvals at once give one record and one 409; resubmission shows what changed.
import { beforeAll, describe, expect, it } from 'vitest';
import { errorBody, makeTestApp, useTestDatabase } from './helpers';
import { testJpeg } from './garage-fixtures';
import { act, current, failingSpec, passingSpec, reviewFixture, savedRun, submitNew, type ReviewFixture } from './review-fixtures';
import { outboxRows } from './mail-helpers';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await reviewFixture(db.ds, app);
});

describe('submitting', () => {
  it('carries the check run, the sheet’s photos and the note; one open submission per sheet', async () => {
    const { builder } = fx.who;
    const { carWithSheet } = await import('./garage-fixtures');
    const { sheetId } = await carWithSheet(builder, fx);
    await builder.agent.post(`/api/build-sheets/${sheetId}/photos`).set('X-CSRF-Token', builder.token)
      .attach('photos', await testJpeg(), 'mh.jpg').field('captions', 'Main hoop, left foot').expect(201);
    const runId = await savedRun(builder, sheetId);
    const res = await builder.agent.post('/api/submissions').set('X-CSRF-Token', builder.token).send({ checkRunId: runId, note: '  Please look at the feet.  ' }).expect(201);
    const s = res.body.submission;
    expect(s).toMatchObject({ state: 'pending', version: 1, builderNote: 'Please look at the feet.', checkRun: { id: runId }, assignedSteward: null });
    expect(s.photos).toHaveLength(1);
    expect(s.photos[0].caption).toBe('Main hoop, left foot');
    expect(s.events).toEqual([expect.objectContaining({ from: null, to: 'pending', action: 'submit' })]);
    const audit = await db.ds.query(`SELECT action FROM audit_entries WHERE entity_id = $1`, [s.id]);
    expect(audit).toEqual([{ action: 'submission.submit' }]);

    const again = await builder.agent.post('/api/submissions').set('X-CSRF-Token', builder.token).send({ checkRunId: runId }).expect(409);
    expect(again.body.error.details).toMatchObject({ reason: 'already_open', submissionId: s.id });
  });

  it('refuses other people’s runs (404) and a steward submitting a run they can only read (403)', async () => {
    const { builder, otherBuilder, steward } = fx.who;
    const { carWithSheet } = await import('./garage-fixtures');
    const { sheetId } = await carWithSheet(builder, fx);
    const runId = await savedRun(builder, sheetId);
    const stranger = await otherBuilder.agent.post('/api/submissions').set('X-CSRF-Token', otherBuilder.token).send({ checkRunId: runId }).expect(404);
    expect(stranger.body).toEqual(errorBody({ error: { code: 'not_found', message: 'Check run not found.' } }));
    await steward.agent.post('/api/submissions').set('X-CSRF-Token', steward.token).send({ checkRunId: runId }).expect(403);
    const bad = await builder.agent.post('/api/submissions').set('X-CSRF-Token', builder.token).send({ checkRunId: 'nope' }).expect(400);
    expect(bad.body.error.details[0].path).toBe('checkRunId');
  });
});

describe('who may see and act', () => {
  it('gives 404 to a steward of another club, another builder and an outsider, for reads and actions alike', async () => {
    const { submissionId } = await submitNew(fx.who.builder, fx);
    for (const who of [fx.who.foreignSteward, fx.who.otherBuilder, fx.who.outsider]) {
      const read = await who.agent.get(`/api/submissions/${submissionId}`).expect(404);
      expect(read.body).toEqual(errorBody({ error: { code: 'not_found', message: 'Submission not found.' } }));
      await who.agent.post(`/api/submissions/${submissionId}/actions`).set('X-CSRF-Token', who.token)
        .send({ type: 'claim', expected: { state: 'pending', version: 1 } }).expect(404);
      await who.agent.post(`/api/submissions/${submissionId}/annotations`).set('X-CSRF-Token', who.token)
        .send({ findingKey: 'x@vehicle', text: 'hello' }).expect(404);
    }
    await fx.who.foreignSteward.agent.get(`/api/clubs/${fx.clubId}/submissions`).expect(404);
    await fx.who.builder.agent.get(`/api/clubs/${fx.clubId}/submissions`).expect(403);
  });

  it('lets a builder neither claim nor decide (403), and nobody decides without a claim', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx);
    const claim = await act(builder, submissionId, { type: 'claim' });
    expect(claim.status).toBe(403);
    expect(claim.body.error.code).toBe('forbidden');
    const early = await act(steward, submissionId, { type: 'approve' });
    expect(early.status).toBe(409);
    expect(early.body.error.details.reason).toBe('wrong_state');
    expect((await act(steward, submissionId, { type: 'claim' })).status).toBe(200);
    const decide = await act(builder, submissionId, { type: 'approve' });
    expect(decide.status).toBe(403);
    expect((await current(steward, submissionId)).state).toBe('in_review');
  });
});

describe('deciding', () => {
  it('refuses to approve a withdrawn submission', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx);
    expect((await act(steward, submissionId, { type: 'claim' })).status).toBe(200);
    const w = await act(builder, submissionId, { type: 'withdraw' });
    expect(w.status).toBe(200);
    expect(w.body.submission.state).toBe('withdrawn');
    const approve = await act(steward, submissionId, { type: 'approve' });
    expect(approve.status).toBe(409);
    expect(approve.body.error.details.reason).toBe('withdrawn');
    const stale = await act(steward, submissionId, { type: 'approve' }, { state: 'in_review', version: 2 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.details).toMatchObject({ reason: 'conflict', state: 'withdrawn', version: 3 });
    expect((await db.ds.query(`SELECT count(*)::int AS n FROM cage_records WHERE submission_id = $1`, [submissionId]))[0].n).toBe(0);
  });

  it('needs a reason for a waiver, and approval needs every failing mandatory finding waived', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx, failingSpec());
    await act(steward, submissionId, { type: 'claim' });
    let s = await current(steward, submissionId);
    const overall = s.overall as { verdict: string; blocking: string[] };
    expect(overall.verdict).toBe('fail');
    expect(overall.blocking.length).toBeGreaterThan(0);
    const blocked = await act(steward, submissionId, { type: 'approve' });
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.details).toMatchObject({ reason: 'unresolved_findings', findingKeys: overall.blocking });

    const noReason = await act(steward, submissionId, { type: 'waive', findingKey: overall.blocking[0], reason: '  ' });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details).toEqual([{ path: 'reason', message: expect.stringContaining('reason for the waiver') }]);
    expect((await current(steward, submissionId)).waivers).toEqual([]);

    for (const key of overall.blocking) {
      const r = await act(steward, submissionId, { type: 'waive', findingKey: key, reason: 'Gauge reading on the car shows a thicker wall than entered.' });
      expect(r.status, JSON.stringify(r.body)).toBe(200);
    }
    s = await current(steward, submissionId);
    expect((s.overall as { verdict: string }).verdict).toBe('pass_with_waivers');
    const ok = await act(steward, submissionId, { type: 'approve', note: 'Checked on the car at the club day.' });
    expect(ok.status).toBe(200);
    expect(ok.body.submission).toMatchObject({ state: 'approved', record: { status: 'valid' } });
  });

  it('lets one of two simultaneous approvals win; the other gets 409 and nothing is decided twice', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx);
    await act(steward, submissionId, { type: 'claim' });
    const seen = await current(steward, submissionId);
    const results = await Promise.all([1, 2].map(() => act(steward, submissionId, { type: 'approve' }, seen)));
    expect(results.map((r) => r.status).sort(), JSON.stringify(results.map((r) => r.body.error))).toEqual([200, 409]);
    const records = await db.ds.query(`SELECT number FROM cage_records WHERE submission_id = $1`, [submissionId]);
    expect(records).toHaveLength(1);
    const events = await db.ds.query(`SELECT action FROM submission_events WHERE submission_id = $1 AND action = 'approve'`, [submissionId]);
    expect(events).toHaveLength(1);
  });

  it('e-mails the builder on each decision, in the decision’s transaction', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx);
    await act(steward, submissionId, { type: 'claim' });
    const before = (await outboxRows(db.ds)).length;
    const short = await act(steward, submissionId, { type: 'reject', reason: 'no' });
    expect(short.status).toBe(400);
    expect((await outboxRows(db.ds)).length).toBe(before);
    expect((await act(steward, submissionId, { type: 'reject', reason: 'The cage is bolted in; this class needs it welded.' })).status).toBe(200);
    const mails = await outboxRows(db.ds);
    expect(mails.length).toBe(before + 1);
    expect(mails.at(-1)).toMatchObject({ to_address: 'builder@tarnwick.example', subject: 'Steward decision on Grey Saloon: rejected' });
  });
});

describe('changes requested and resubmission', () => {
  it('links the new submission to the old, shows the revision diff, and never resubmits twice', async () => {
    const { builder, steward } = fx.who;
    const first = await submitNew(builder, fx, failingSpec());
    await act(steward, first.submissionId, { type: 'claim' });
    const noNote = await act(steward, first.submissionId, { type: 'request_changes', note: '' });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.details[0].path).toBe('note');
    expect((await act(steward, first.submissionId, { type: 'request_changes', note: 'Door bars need a thicker wall, see section.' })).status).toBe(200);

    const plainSubmit = await builder.agent.post('/api/submissions').set('X-CSRF-Token', builder.token).send({ checkRunId: first.runId }).expect(409);
    expect(plainSubmit.body.error.details.reason).toBe('resubmit_instead');
    const old = await current(builder, first.submissionId);
    const same = await builder.agent.post(`/api/submissions/${first.submissionId}/resubmit`).set('X-CSRF-Token', builder.token)
      .send({ checkRunId: first.runId, expected: { state: old.state, version: old.version } }).expect(400);
    expect(same.body.error.details[0].path).toBe('checkRunId');

    await builder.agent.put(`/api/build-sheets/${first.sheetId}/specification`).set('X-CSRF-Token', builder.token)
      .send({ baseRevision: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: passingSpec() }).expect(200);
    const runId = await savedRun(builder, first.sheetId);
    const res = await builder.agent.post(`/api/submissions/${first.submissionId}/resubmit`).set('X-CSRF-Token', builder.token)
      .send({ checkRunId: runId, note: 'Door bars now 0.095 in wall.', expected: { state: old.state, version: old.version } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const next = res.body.submission;
    // Back with the steward who asked for the changes (tests/api/review-return.test.ts has the rest).
    expect(next).toMatchObject({ state: 'in_review', assignedSteward: { displayName: 'Imogen Feld' }, previousSubmissionId: first.submissionId, builderNote: 'Door bars now 0.095 in wall.' });
    expect(next.changesSince).toMatchObject({ previousSubmissionId: first.submissionId, fromRevision: 1, toRevision: 2, rulesetChanged: false });
    expect(next.changesSince.changes.some((c: { subjectId: string; field: string }) => c.subjectId === 'db1' && c.field === 'wallMm')).toBe(true);
    expect(next.history).toEqual([expect.objectContaining({ id: first.submissionId, state: 'changes_requested' })]);

    const oldNow = await current(builder, first.submissionId);
    expect(oldNow).toMatchObject({ state: 'changes_requested', resubmittedAsId: next.id });
    const twice = await builder.agent.post(`/api/submissions/${first.submissionId}/resubmit`).set('X-CSRF-Token', builder.token)
      .send({ checkRunId: runId, expected: { state: oldNow.state, version: oldNow.version } }).expect(409);
    expect(twice.body.error.details.reason).toBe('already_open');
  });
});

describe('annotations, the queue and the stewards’ mail', () => {
  it('lets a steward annotate a finding of the report, not an invented one', async () => {
    const { builder, steward } = fx.who;
    const { submissionId } = await submitNew(builder, fx);
    const s = await current(steward, submissionId);
    const report = (s.checkRun as { report: { findings: { requirementId: string; member?: { id: string } | null }[] } }).report;
    const f = report.findings.find((x) => x.member)!;
    const key = `${f.requirementId}@member:${f.member!.id}`;
    const res = await steward.agent.post(`/api/submissions/${submissionId}/annotations`).set('X-CSRF-Token', steward.token).send({ findingKey: key, text: 'Photo shows the gusset.' }).expect(201);
    expect(res.body.submission.annotations).toEqual([expect.objectContaining({ findingKey: key, text: 'Photo shows the gusset.', author: expect.objectContaining({ displayName: 'Imogen Feld' }) })]);
    await steward.agent.post(`/api/submissions/${submissionId}/annotations`).set('X-CSRF-Token', steward.token).send({ findingKey: 'made-up@vehicle', text: 'x' }).expect(400);
    await builder.agent.post(`/api/submissions/${submissionId}/annotations`).set('X-CSRF-Token', builder.token).send({ findingKey: key, text: 'x' }).expect(403);
  });

  it('filters by state, class, age and assignee, sorts, and counts by state', async () => {
    const { builder, steward, admin } = fx.who;
    const a = await submitNew(builder, fx);
    const b = await submitNew(builder, fx);
    await act(steward, a.submissionId, { type: 'claim' });
    await db.ds.query(`UPDATE submissions SET created_at = now() - interval '10 days' WHERE id = $1`, [b.submissionId]);
    const url = `/api/clubs/${fx.clubId}/submissions`;
    const all = (await steward.agent.get(`${url}?state=all`).expect(200)).body;
    // A request for changes the builder answered with a resubmission (the test above) no longer counts.
    const counted = await db.ds.query(
      `SELECT state, count(*)::int AS n FROM submissions WHERE club_id = $1 AND NOT (state = 'changes_requested' AND resubmitted_as_id IS NOT NULL) GROUP BY state`,
      [fx.clubId],
    );
    for (const c of counted) expect(all.counts[c.state]).toBe(c.n);
    expect(all.counts.changes_requested).toBe(0);
    expect(all.classes).toEqual([{ id: 'club-saloon', name: expect.any(String) }]);
    const mine = (await steward.agent.get(`${url}?assigned=me`).expect(200)).body.items.map((i: { id: string }) => i.id);
    expect(mine).toContain(a.submissionId);
    expect(mine).not.toContain(b.submissionId);
    expect((await admin.agent.get(`${url}?assigned=me`).expect(200)).body.items).toEqual([]);
    const old = (await steward.agent.get(`${url}?age=over_7_days`).expect(200)).body.items.map((i: { id: string }) => i.id);
    expect(old).toEqual([b.submissionId]);
    const pending = (await steward.agent.get(`${url}?state=pending&sort=oldest`).expect(200)).body.items;
    expect(pending[0].id).toBe(b.submissionId);
    expect(pending.every((i: { state: string }) => i.state === 'pending')).toBe(true);
    expect((await steward.agent.get(`${url}?classId=no-such-class`).expect(200)).body.items).toEqual([]);
    const bad = await steward.agent.get(`${url}?sort=sideways`).expect(400);
    expect(bad.body.error.details[0].path).toBe('query.sort');
  });

  it('mails opted-in stewards of the club about new submissions', async () => {
    const { builder, steward } = fx.who;
    await builder.agent.put(`/api/clubs/${fx.clubId}/review-mail`).set('X-CSRF-Token', builder.token).send({ enabled: true }).expect(403);
    expect((await steward.agent.get(`/api/clubs/${fx.clubId}/review-mail`).expect(200)).body).toEqual({ enabled: false });
    await steward.agent.put(`/api/clubs/${fx.clubId}/review-mail`).set('X-CSRF-Token', steward.token).send({ enabled: true }).expect(200);
    const before = (await outboxRows(db.ds)).length;
    await submitNew(builder, fx);
    const mails = (await outboxRows(db.ds)).slice(before);
    expect(mails.map((m) => m.to_address)).toEqual(['steward@tarnwick.example']);
    expect(mails[0]!.subject).toBe('New submission for review: Grey Saloon');
    await steward.agent.put(`/api/clubs/${fx.clubId}/review-mail`).set('X-CSRF-Token', steward.token).send({ enabled: false }).expect(200);
  });
});
