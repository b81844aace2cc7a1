// One story on every screen (issue 13 §1, §2): a submission approved with one waived finding reads
// "Approved with 1 waiver" in the queue, the garage, the car's sheets, the submission, the decision
// mail and the PDF (banner and summary page), and the waived finding shows as waived with its reason.
// A request for changes the builder answered with a resubmission no longer counts as open.
import { execFileSync } from 'node:child_process';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { approvedText, reviewVerdictText, submissionStateText } from '../../backend/src/contracts/verdict-words';
import { makeTestApp, useTestDatabase } from './helpers';
import { act, current, passingSpec, reviewFixture, savedRun, submitNew, type ReviewFixture } from './review-fixtures';

const db = useTestDatabase();
let fx: ReviewFixture;

beforeAll(async () => {
  fx = await reviewFixture(db.ds, makeTestApp(db.ds));
});

/** One door bar of 0.049 in wall (F-UNIT-1: 1 in = 25.4 mm), under the demo rulebook's minimum; the rest passes. */
function oneThinDoorBar() {
  const spec = passingSpec();
  spec.members = spec.members.map((m) => (m.id === 'db1' ? { ...m, wallMm: 0.049 * 25.4 } : m));
  return spec;
}

describe('the words', () => {
  it.each([
    [0, 'Approved'],
    [1, 'Approved with 1 waiver'],
    [3, 'Approved with 3 waivers'],
  ])('approvedText(%i) = %j', (n, words) => {
    expect(approvedText(n)).toBe(words);
    expect(submissionStateText('approved', { waivedCount: n })).toBe(words);
  });

  it('reads an answered request for changes as resubmitted, and a waived pass as one', () => {
    expect(submissionStateText('changes_requested')).toBe('Changes requested');
    expect(submissionStateText('changes_requested', { resubmitted: true })).toBe('Changes made and resubmitted');
    expect(reviewVerdictText('pass_with_waivers', 1)).toBe('Meets the rules with 1 waiver');
  });
});

describe('approved with one waiver', () => {
  it('says so in the queue, the garage, the submission, the mail and the PDF', async () => {
    const { builder, steward } = fx.who;
    const { submissionId, carId, sheetId } = await submitNew(builder, fx, oneThinDoorBar());
    await act(steward, submissionId, { type: 'claim' });
    const before = await current(steward, submissionId);
    const overall = before.overall as { verdict: string; blocking: string[] };
    expect(overall.verdict).toBe('fail');
    expect(overall.blocking).toHaveLength(1);
    const reason = 'Sonic gauge reads 0.095 in on db1; the sheet has a typing slip.';
    expect((await act(steward, submissionId, { type: 'waive', findingKey: overall.blocking[0], reason })).status).toBe(200);
    const res = await act(steward, submissionId, { type: 'approve' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const s = res.body.submission;
    expect(s.overall).toEqual({ verdict: 'pass_with_waivers', blocking: [], waivedCount: 1 });
    const record = s.record as { number: string; expiresAt: string; expiresOn: string };

    // The queue: the state counts its waiver; the verdict is the one with the waiver counted.
    const queue = (await steward.agent.get(`/api/clubs/${fx.clubId}/submissions?state=approved`).expect(200)).body;
    const item = queue.items.find((i: { id: string }) => i.id === submissionId);
    expect(item).toMatchObject({ state: 'approved', verdict: 'fail', reviewVerdict: 'pass_with_waivers', waivedCount: 1 });
    expect(submissionStateText(item.state, { waivedCount: item.waivedCount })).toBe('Approved with 1 waiver');

    // The garage and the car page: the sheet's review state and its record, linked to the submission.
    const cars = (await builder.agent.get('/api/cars').expect(200)).body.cars as { id: string; buildSheets: { id: string; review: unknown }[] }[];
    const sheet = cars.find((c) => c.id === carId)!.buildSheets.find((b) => b.id === sheetId)!;
    expect(sheet.review).toEqual({
      submissionId, state: 'approved', revisionNumber: 1, verdict: 'pass_with_waivers', waivedCount: 1, sentAt: expect.any(String), decidedAt: expect.any(String),
      record: { id: expect.any(String), number: record.number, status: 'valid', expiresAt: record.expiresAt, expiresOn: record.expiresOn, submissionId, waivedCount: 1, revisionNumber: 1 },
    });
    const car = (await builder.agent.get(`/api/cars/${carId}`).expect(200)).body.car;
    expect(car.buildSheets[0].review).toEqual(sheet.review);

    // The builder's own list of submissions (the check run page reads it).
    const mine = (await builder.agent.get(`/api/submissions`).expect(200)).body.submissions;
    expect(mine.find((m: { id: string }) => m.id === submissionId)).toMatchObject({ state: 'approved', waivedCount: 1 });

    // The decision mail: the same words, and the waived finding with its reason.
    const [mail] = await db.ds.query(`SELECT subject, text_body FROM outbox_messages WHERE kind = 'review.decided' AND related->>'submissionId' = $1`, [submissionId]);
    expect(mail.subject).toBe('Steward decision on Grey Saloon: approved with 1 waiver');
    expect(mail.text_body).toContain('approved your submission for Grey Saloon in Tarnwick Vale Motor Club. Approved with 1 waiver.');
    expect(mail.text_body).toMatch(/door bar db1 \(section [^)]+\): Sonic gauge reads 0\.095 in on db1/);
    expect(mail.text_body).toContain(`Cage record ${record.number} is issued, valid until`);

    // The PDF: the banner and the summary page say approved with 1 waiver; the finding reads waived, with its reason.
    const pdf = await builder.agent.get(`/api/submissions/${submissionId}/report.pdf?units=imperial`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    const dir = await mkdtemp(join(tmpdir(), 'cw-waiver-pdf-'));
    await writeFile(join(dir, 'r.pdf'), pdf.body as Buffer);
    const firstPage = execFileSync('pdftotext', ['-f', '1', '-l', '1', join(dir, 'r.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    const text = execFileSync('pdftotext', [join(dir, 'r.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(firstPage).toContain('APPROVED WITH 1 WAIVER');
    expect(firstPage).not.toContain('DOES NOT PASS');
    expect(firstPage).toMatch(/\d+ pass · 1 waived · 0 fail/);
    expect(firstPage).toContain('Approved with 1 waiver, by Imogen Feld');
    expect(firstPage).not.toContain('Not met yet');
    expect(text).toContain(`Waived by Imogen Feld: ${reason}`);
    expect(text).not.toMatch(/Does not meet it[^.]*door bar "db1"/);
  });
});

describe('a request for changes answered by a resubmission', () => {
  it('is no longer counted or listed as changes requested', async () => {
    const { builder, steward } = fx.who;
    const first = await submitNew(builder, fx, oneThinDoorBar());
    await act(steward, first.submissionId, { type: 'claim' });
    expect((await act(steward, first.submissionId, { type: 'request_changes', note: 'Door bar db1 is too thin, see section.' })).status).toBe(200);
    const url = `/api/clubs/${fx.clubId}/submissions`;
    const asked = (await steward.agent.get(`${url}?state=changes_requested`).expect(200)).body;
    expect(asked.items.map((i: { id: string }) => i.id)).toContain(first.submissionId);
    const askedCount = asked.counts.changes_requested as number;

    await builder.agent.put(`/api/build-sheets/${first.sheetId}/specification`).set('X-CSRF-Token', builder.token)
      .send({ baseRevision: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: passingSpec() }).expect(200);
    const runId = await savedRun(builder, first.sheetId);
    const old = await current(builder, first.submissionId);
    const res = await builder.agent.post(`/api/submissions/${first.submissionId}/resubmit`).set('X-CSRF-Token', builder.token)
      .send({ checkRunId: runId, expected: { state: old.state, version: old.version } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);

    const after = (await steward.agent.get(`${url}?state=changes_requested`).expect(200)).body;
    expect(after.items.map((i: { id: string }) => i.id)).not.toContain(first.submissionId);
    expect(after.counts.changes_requested).toBe(askedCount - 1);
    const all = (await steward.agent.get(`${url}?state=all`).expect(200)).body.items;
    expect(all.find((i: { id: string }) => i.id === first.submissionId)).toMatchObject({ state: 'changes_requested', resubmittedAsId: res.body.submission.id });
    // The garage shows the sheet's latest submission: the resubmission, back with the steward who asked
    // for the changes (tests/api/review-return.test.ts), so being reviewed.
    const cars = (await builder.agent.get('/api/cars').expect(200)).body.cars as { buildSheets: { id: string; review: { submissionId: string; state: string } | null }[] }[];
    const sheet = cars.flatMap((c) => c.buildSheets).find((b) => b.id === first.sheetId)!;
    expect(sheet.review).toMatchObject({ submissionId: res.body.submission.id, state: 'in_review' });
    const detail = await current(builder, first.submissionId);
    expect(submissionStateText(detail.state as 'changes_requested', { resubmitted: detail.resubmittedAsId !== null })).toBe('Changes made and resubmitted');
  });
});
