// Check runs of a build sheet and the PDF report: the owner runs a check of the latest revision
// (saved with its revision, the sheet's latest verdict updated), the club's stewards and admins
// list runs and read the report but may not run checks, others get 404. The PDF's text is read
// back with pdftotext: title, verdict, section numbers, the caution on every page, units.
import { execFileSync } from 'node:child_process';
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { hasErrorBody, makeTestApp, testConfig, testPublicUrl, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, saloonSpec, testJpeg, type GarageFixture } from './garage-fixtures';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;
let sheetId: string;
let runId: string;
let workDir: string;

const caution = 'Cagewright gives a pre-check only. The sanctioning body’s inspector decides whether a cage passes. Welding and fabrication belong to qualified people working under local rules.';

/** pdftotext of one page (or all), with line breaks folded so sentences can be matched whole. */
async function pdfText(pdf: Buffer, page?: number): Promise<string> {
  const file = join(workDir, `${randomUUID()}.pdf`);
  await writeFile(file, pdf);
  const args = page ? ['-f', String(page), '-l', String(page)] : [];
  return execFileSync('pdftotext', [...args, file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

function pageCount(pdf: Buffer): number {
  return Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', ['-'], { input: pdf, encoding: 'utf8' }))![1]);
}

const getPdf = (agent: typeof who.builder.agent, path: string) =>
  agent.get(path).buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });

beforeAll(async () => {
  workDir = await mkdtemp(join(tmpdir(), 'cw-reports-api-'));
  app = makeTestApp(db.ds, { config: testConfig({ UPLOAD_DIR: join(workDir, 'uploads') }) });
  fx = await garageFixture(db.ds);
  who = await everyone(app);
  // A 1.500 × 0.065 in door bar is under the saloon class's 1.500 × 0.095 in (section C4.3.1): a fail.
  ({ sheetId } = await carWithSheet(who.builder, fx, saloonSpec({ doorBarWallMm: 1.65 })));
  await who.builder.agent.post(`/api/build-sheets/${sheetId}/photos`).set('X-CSRF-Token', who.builder.token)
    .attach('photos', await testJpeg(), 'foot.jpg').field('captions', 'Left main hoop foot plate').field('memberIds', 'mh').expect(201);
});

describe('running checks', () => {
  it('checks the latest revision, saves the run with its revision and updates the sheet', async () => {
    const res = await who.builder.agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', who.builder.token).expect(201);
    const run = res.body.checkRun;
    expect(run).toMatchObject({ buildSheetId: sheetId, revisionNumber: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', overallVerdict: 'fail' });
    expect(run.verificationCode).toMatch(/^([0-9A-HJKMNP-TV-Z]{4}-){6}[0-9A-HJKMNP-TV-Z]{4}$/);
    const doorBar = run.report.findings.find((f: { requirementId: string; member: { id: string } | null }) => f.requirementId === 'tv-secondary-tubes' && f.member?.id === 'db-l');
    expect(doorBar).toMatchObject({ verdict: 'fail', citation: { section: 'C4.3.1' } });
    runId = run.id;
    const stored: { build_sheet_revision_id: string; number: number }[] = await db.ds.query(
      `SELECT c.build_sheet_revision_id, r.number FROM check_runs c JOIN build_sheet_revisions r ON r.id = c.build_sheet_revision_id WHERE c.id = $1`, [runId]);
    expect(stored).toEqual([{ build_sheet_revision_id: run.buildSheetRevisionId, number: 1 }]);
    const sheet = await who.builder.agent.get(`/api/build-sheets/${sheetId}`).expect(200);
    expect(sheet.body.buildSheet).toMatchObject({ latestCheckRunId: runId, latestVerdict: 'fail', latestCheckedRevision: 1 });
  });

  it('lists the sheet’s runs, newest first, for the owner and the club’s stewards and admins', async () => {
    await who.builder.agent.put(`/api/build-sheets/${sheetId}/specification`).set('X-CSRF-Token', who.builder.token)
      .send({ baseRevision: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() }).expect(200);
    const second = await who.builder.agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', who.builder.token).expect(201);
    expect(second.body.checkRun.revisionNumber).toBe(2);
    for (const role of ['builder', 'steward', 'admin'] as const) {
      const list = await who[role].agent.get(`/api/build-sheets/${sheetId}/check-runs`).expect(200);
      expect(list.body.checkRuns.map((r: { id: string; revisionNumber: number }) => [r.id, r.revisionNumber])).toEqual([[second.body.checkRun.id, 2], [runId, 1]]);
    }
  });

  it('refuses stewards and admins (403) and everyone else (404)', async () => {
    for (const role of ['steward', 'admin'] as const) {
      await who[role].agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', who[role].token).expect(403);
    }
    for (const role of ['otherBuilder', 'outsider'] as const) {
      await who[role].agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', who[role].token).expect(404);
      await who[role].agent.get(`/api/build-sheets/${sheetId}/check-runs`).expect(404);
    }
    await request(app).get(`/api/build-sheets/${sheetId}/check-runs`).expect(401);
  });
});

describe('the PDF report', () => {
  it('is a real PDF with searchable text: title, car, rules, verdict, sections, tube data, code, and the caution on every page', async () => {
    const res = await getPdf(who.builder.agent, `/api/check-runs/${runId}/report.pdf`).expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toMatch(/^inline; filename="cagewright-pre-check-([0-9A-Z]{4}-){6}[0-9A-Z]{4}\.pdf"$/);
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const text = await pdfText(pdf);
    for (const expected of [
      'Cagewright pre-check report', 'Grey Saloon', 'Varden Corsair', '1994', 'Race number 47',
      'Tarnwick Vale MC Cage Regulations', 'Tarnwick Vale Motor Club', 'Club Saloon (full cage)',
      'DOES NOT PASS THE PRE-CHECK', 'Section C4.3.1', 'Section C4.2.2', 'Robin Ashcombe',
      // The builder's units are imperial: 38.1 × 1.65 mm is 1.500 × 0.065 in (F-UNIT-1).
      '1.500 × 0.065 in', 'Cut list', 'Estimated tube mass', 'Left main hoop foot plate',
      // Members by the builder's names (these have no labels: the kind's words, numbered when repeated).
      'door bar 1', 'rear brace (backstay) 2',
    ]) expect(text).toContain(expected);
    // Never an internal id: not in findings, tube data, the cut list or the photo captions.
    expect(text).not.toMatch(/"(mh|fh|rb-l|rb-r|hb|db-l|db-r|dg)"/);
    expect(text).not.toMatch(/\b(rb-l|rb-r|db-l|db-r)\b/);
    const code = (await who.builder.agent.get(`/api/check-runs/${runId}`).expect(200)).body.checkRun.verificationCode;
    expect(text).toContain(code);
    // Issue 9 §5: the code leads somewhere, and the PDF says what the page will say about it.
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain(`${testPublicUrl}/verify/${code}: the page says this is a pre-check made on`);
    expect(flat).toContain('with its result, and not a cage record.');
    const page = await request(app).get(`/api/verify/${code}`);
    expect(page.status, JSON.stringify(page.body)).toBe(200);
    expect(page.body.kind).toBe('check_run');
    expect(flat).toContain(`pre-check made on ${page.body.checkRun.checkedOn}`);
    const pages = pageCount(pdf);
    expect(pages).toBeGreaterThan(1);
    for (let p = 1; p <= pages; p++) expect(await pdfText(pdf, p)).toContain(caution);
    expect(execFileSync('pdffonts', ['-'], { input: pdf, encoding: 'utf8' })).toMatch(/NotoSans-Regular.*yes/);
  });

  it('is written in metric units when asked', async () => {
    const res = await getPdf(who.builder.agent, `/api/check-runs/${runId}/report.pdf?units=metric`).expect(200);
    const text = await pdfText(res.body as Buffer);
    expect(text).toContain('38.1 × 1.65 mm');
    expect(text).not.toContain('1.500 × 0.065 in');
    // Issue 9 §4: the run was checked in the builder's inch units; its reasons are written again from
    // their stored parts in the reader's metric, sizes included, and a failing one says what to change.
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain('To pass, use');
    expect(flat).toMatch(/Nearest: mild steel 38\.1 × 2\.41 mm/); // 1.500 × 0.095 in (F-UNIT-1, computed)
    expect(flat).not.toMatch(/\d in (is|\(|;|in )/);
    await who.builder.agent.get(`/api/check-runs/${runId}/report.pdf?units=furlongs`).expect(400);
  });

  it.each(['steward', 'admin'] as const)('may be read by a club %s', async (role) => {
    const res = await getPdf(who[role].agent, `/api/check-runs/${runId}/report.pdf`).expect(200);
    expect(await pdfText(res.body as Buffer)).toContain('DOES NOT PASS THE PRE-CHECK');
  });

  it.each(['otherBuilder', 'outsider'] as const)('is 404 for the %s, as for an unknown run', async (role) => {
    const gone = { error: { code: 'not_found', message: 'Check run not found.' } };
    await who[role].agent.get(`/api/check-runs/${runId}/report.pdf`).expect(404).expect(hasErrorBody(gone));
    await who.builder.agent.get(`/api/check-runs/${randomUUID()}/report.pdf`).expect(404).expect(hasErrorBody(gone));
  });
});
