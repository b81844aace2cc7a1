// Fabrication routes: the cope and its template PDF, and the hoop leg trim. Signed-in users only; bad
// input is a 400 at its field and never a drawing or a PDF.
import { execFileSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { agentFor, demo, makeTestApp, signIn, useTestDatabase, type Agent } from './helpers';
import { carWithSheet, everyone, garageFixture } from './garage-fixtures';
import { modelSpec } from '../fixtures/fabrication-model';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let builder: Agent;
let token: string;

const binary = (agent: Agent, path: string, body: object, csrf: string) =>
  agent.post(path).set('X-CSRF-Token', csrf).send(body).buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });

beforeAll(async () => {
  app = makeTestApp(db.ds);
  builder = agentFor(app);
  token = await signIn(builder, demo.builder);
});

describe('POST /api/fabrication/cope', () => {
  it('refuses a visitor who is not signed in', async () => {
    const anon = agentFor(app);
    const res = await anon.post('/api/fabrication/cope').send({ branchOdMm: 38, runOdMm: 45, angleDeg: 90, offsetMm: 0 });
    expect([401, 403]).toContain(res.status);
  });
  it('returns the curve at every degree, the depth and the unrolled length', async () => {
    const res = await builder.post('/api/fabrication/cope').set('X-CSRF-Token', token).send({ branchOdMm: 50.8, runOdMm: 152.4, angleDeg: 90, offsetMm: 0 }).expect(200);
    expect(res.body.cope.curve).toHaveLength(361);
    // 2 in on 6 in at 90° → 0.172 in (published pipe-saddle example, ±0.001 in).
    expect(Math.abs(res.body.cope.depthMm / 25.4 - 0.172)).toBeLessThanOrEqual(0.001);
    expect(res.body.cope.unrolledLengthMm).toBeCloseTo(Math.PI * 50.8, 6);
    expect(res.body.cope.markingTable).toHaveLength(24);
  });
  it.each([
    [{ branchOdMm: 50, runOdMm: 45, angleDeg: 90, offsetMm: 0 }, 'branchOdMm', 'The branch cannot be wider than the tube it meets.'],
    [{ branchOdMm: 38, runOdMm: 45, angleDeg: 12, offsetMm: 0 }, 'angleDeg', 'The angle between the tubes must be from 15° to 90°.'],
    [{ branchOdMm: 38, runOdMm: 45, angleDeg: 60, offsetMm: 10 }, 'offsetMm', expect.stringContaining('takes the branch off the run')],
    [{ branchOdMm: '38', runOdMm: 45, angleDeg: 60 }, 'branchOdMm', expect.any(String)],
  ])('refuses %o at %s', async (body, path, message) => {
    const res = await builder.post('/api/fabrication/cope').set('X-CSRF-Token', token).send(body).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toContainEqual({ path, message });
  });
});

describe('POST /api/fabrication/cope.pdf', () => {
  it('returns a PDF template on the page size chosen, tiled when large', async () => {
    const res = await binary(builder, '/api/fabrication/cope.pdf', { branchOdMm: 100, runOdMm: 120, angleDeg: 30, offsetMm: 5, pageSize: 'Letter', memberName: 'dash bar end' }, token).expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const info = execFileSync('pdfinfo', ['-'], { input: res.body as Buffer, encoding: 'utf8' });
    expect(Number(/Pages:\s+(\d+)/.exec(info)![1])).toBeGreaterThan(1);
    // Letter landscape is 792 × 612 pt.
    expect(info).toMatch(/Page size:\s+792 x 612 pts/);
    const text = execFileSync('pdftotext', ['-f', '1', '-l', '1', '-', '-'], { input: res.body as Buffer, encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('Print at actual size, then check the ruler.');
    expect(text).toContain('dash bar end');
    expect(text).toContain('Welding and fabrication belong to qualified people working under local rules.');
  });
  it('refuses bad input with JSON, not a PDF', async () => {
    const res = await builder.post('/api/fabrication/cope.pdf').set('X-CSRF-Token', token).send({ branchOdMm: 50, runOdMm: 45, angleDeg: 90, offsetMm: 0, pageSize: 'A3' }).expect(400);
    expect(res.headers['content-type']).toMatch(/json/);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toContain('pageSize');
  });
});

describe('POST /api/fabrication/leg-trim', () => {
  it('gives each leg its cut and a side view', async () => {
    const res = await builder.post('/api/fabrication/leg-trim').set('X-CSRF-Token', token)
      .send({ legs: [{ uncutMm: 1250, padHeightMm: 0 }, { uncutMm: 1250, padHeightMm: 12 }], leanDeg: 10, odMm: 44.45 }).expect(200);
    expect(res.body.legTrim.legs[0].trimMm).toBeCloseTo(0, 6);
    expect(res.body.legTrim.legs[1].trimMm).toBeCloseTo(12 / Math.cos((10 * Math.PI) / 180), 6);
    expect(res.body.legTrim.sideViewSvg).toMatch(/^<svg/);
  });
  it('refuses a pad the leg cannot reach, at the pad', async () => {
    const res = await builder.post('/api/fabrication/leg-trim').set('X-CSRF-Token', token)
      .send({ legs: [{ uncutMm: 1250, padHeightMm: 0 }, { uncutMm: 1250, padHeightMm: 0 }], leanDeg: 0, topHeightMm: 1300, odMm: 44.45 }).expect(400);
    expect(res.body.error.details).toContainEqual({ path: 'legs.0.padHeightMm', message: 'The left leg cannot reach this pad: it is 50 mm short.' });
  });
});

describe('fabrication settings, per user', () => {
  it('starts from defaults in the builder’s units and keeps what is saved', async () => {
    const fresh = await builder.get('/api/fabrication/settings').expect(200);
    expect(fresh.body.settings).toMatchObject({ dies: [], saved: false, kerfMm: 2 });
    const settings = { dies: [{ name: '150 mm die', clrMm: 150, setDeg: 93, heldDeg: 90 }], trimAllowanceMm: 4, stickLengthMm: 6000, kerfMm: 1.5 };
    const saved = await builder.put('/api/fabrication/settings').set('X-CSRF-Token', token).send(settings).expect(200);
    expect(saved.body.settings).toEqual({ ...settings, saved: true });
    expect((await builder.get('/api/fabrication/settings').expect(200)).body.settings).toEqual({ ...settings, saved: true });
  });
  it.each([
    [{ dies: [{ name: 'd', clrMm: 150, setDeg: 88, heldDeg: 90 }], trimAllowanceMm: 4, stickLengthMm: 6000, kerfMm: 2 }, 'dies.0.heldDeg'],
    [{ dies: [], trimAllowanceMm: -1, stickLengthMm: 6000, kerfMm: 2 }, 'trimAllowanceMm'],
    [{ dies: [], trimAllowanceMm: 4, stickLengthMm: 60000, kerfMm: 2 }, 'stickLengthMm'],
    [{ dies: [], trimAllowanceMm: 4, stickLengthMm: 6000, kerfMm: -2 }, 'kerfMm'],
  ])('refuses %o at %s and keeps the saved settings', async (body, path) => {
    const before = (await builder.get('/api/fabrication/settings').expect(200)).body.settings;
    const res = await builder.put('/api/fabrication/settings').set('X-CSRF-Token', token).send(body).expect(400);
    expect((res.body.error.details as { path: string }[]).map((d) => d.path)).toContain(path);
    expect((await builder.get('/api/fabrication/settings').expect(200)).body.settings).toEqual(before);
  });
});

describe('a build sheet’s fabrication', () => {
  let sheetId: string;
  let who: Awaited<ReturnType<typeof everyone>>;
  beforeAll(async () => {
    const fx = await garageFixture(db.ds);
    who = await everyone(app);
    await who.builder.agent.put('/api/fabrication/settings').set('X-CSRF-Token', who.builder.token).send({ dies: [], trimAllowanceMm: 3, stickLengthMm: 6000, kerfMm: 2 }).expect(200);
    ({ sheetId } = await carWithSheet(who.builder, fx, modelSpec));
  });
  it('gives the schedule per member from the model, copes per end and the buying list', async () => {
    const res = await who.builder.agent.get(`/api/build-sheets/${sheetId}/fabrication`).expect(200);
    const fab = res.body.fabrication;
    const hb = fab.members.find((m: { memberId: string }) => m.memberId === 'hb');
    expect(hb).toMatchObject({ source: 'model', name: 'harness bar', ends: [{ kind: 'saddle' }, { kind: 'saddle' }] });
    expect(fab.members.find((m: { memberId: string }) => m.memberId === 'br').ends[0].kind).toBe('not_a_saddle');
    expect(fab.buyingList.groups.length).toBeGreaterThan(0);
  });
  it('lets the club’s steward read it and refuses someone outside the club', async () => {
    await who.steward.agent.get(`/api/build-sheets/${sheetId}/fabrication`).expect(200);
    await who.outsider.agent.get(`/api/build-sheets/${sheetId}/fabrication`).expect(404);
  });
  it('offers the buying list as CSV', async () => {
    const res = await who.builder.agent.get(`/api/build-sheets/${sheetId}/buying-list.csv?units=metric`).expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="cagewright-buying-list-Full-cage-2027.csv"/);
    expect(res.text.split('\r\n')[0]).toBe('tube,material,stick,member,piece length (mm),offcut of stick (mm),mass per metre (kg/m)');
    expect(res.text).toContain('harness bar');
  });
  describe('a hoop’s measured legs', () => {
    const legs = (as: { agent: Agent; token: string }, method: 'put' | 'delete', memberId = 'mh') => as.agent[method](`/api/build-sheets/${sheetId}/fabrication/legs/${memberId}`).set('X-CSRF-Token', as.token);
    const mhOf = async () => (await who.builder.agent.get(`/api/build-sheets/${sheetId}/fabrication`).expect(200)).body.fabrication.members.find((m: { memberId: string }) => m.memberId === 'mh');
    // The model's hoop leans back atan(150 / 1150) = 7.43° (computed); the right pad measured 12 mm higher.
    const leanDeg = (Math.atan(150 / 1150) * 180) / Math.PI;
    const body = { legs: [{ uncutMm: 1260, padHeightMm: 0 }, { uncutMm: 1260, padHeightMm: 12 }], leanDeg };

    it('keeps them with the sheet and cuts each leg to its own pad', async () => {
      const res = await legs(who.builder, 'put').send(body).expect(200);
      const cos = Math.cos((leanDeg * Math.PI) / 180);
      // The lower left pad sets the top; the right leg loses 12 / cos(lean) = 12.10 mm (computed).
      expect(res.body.measuredLegs.result.legs[0].trimMm).toBeCloseTo(0, 9);
      expect(res.body.measuredLegs.result.legs[1].trimMm).toBeCloseTo(12 / cos, 9);
      expect(res.body.measuredLegs.input).toMatchObject({ leanDeg, savedBy: expect.any(String) });
      const mh = await mhOf();
      expect(mh.measuredLegs.result.legs[1].cutHeightMm).toBeCloseTo(1260 - 12 / cos, 9);
      expect(mh.legCut).not.toBeNull();
      // The steward reads them with the sheet.
      const steward = (await who.steward.agent.get(`/api/build-sheets/${sheetId}/fabrication`).expect(200)).body.fabrication.members.find((m: { memberId: string }) => m.memberId === 'mh');
      expect(steward.measuredLegs.input.legs).toEqual(body.legs);
    });
    it('refuses pads the legs cannot reach at the pad, and keeps what was saved', async () => {
      const res = await legs(who.builder, 'put').send({ ...body, topHeightMm: 1400 }).expect(400);
      expect(res.body.error.details).toEqual([
        { path: 'legs.0.padHeightMm', message: expect.stringMatching(/^The left leg cannot reach this pad: it is [\d.]+ mm short\.$/) },
        { path: 'legs.1.padHeightMm', message: expect.stringMatching(/^The right leg cannot reach this pad/) },
      ]);
      const bad = await legs(who.builder, 'put').send({ legs: [{ uncutMm: -5, padHeightMm: 0 }, { uncutMm: 1260, padHeightMm: 0 }], leanDeg: 95, extra: true }).expect(400);
      expect(bad.body.error.details.map((d: { path: string }) => d.path)).toEqual(['']);
      expect((await mhOf()).measuredLegs.input.legs).toEqual(body.legs);
    });
    it('is the builder’s alone, and only for a hoop of the latest revision', async () => {
      await legs(who.steward, 'put').send(body).expect(403);
      await legs(who.otherBuilder, 'put').send(body).expect(404);
      await legs(who.steward, 'delete').expect(403);
      const notHoop = await legs(who.builder, 'put', 'hb').send(body).expect(404);
      expect(notHoop.body.error.message).toMatch(/has no hoop "hb"/);
    });
    it('forgets them on request: the leg cuts come from the model again', async () => {
      await legs(who.builder, 'delete').expect(204);
      const mh = await mhOf();
      expect(mh.measuredLegs).toBeNull();
      expect(mh.legCut.legs).toHaveLength(2);
    });
  });

  it('puts the buying list on a page of the PDF report', async () => {
    const run = await who.builder.agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', who.builder.token).expect(201);
    const pdf = await who.builder.agent.get(`/api/check-runs/${run.body.checkRun.id}/report.pdf?units=metric`).buffer(true).parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    }).expect(200);
    const text = execFileSync('pdftotext', ['-', '-'], { input: pdf.body as Buffer, encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('Buying list');
    expect(text).toMatch(/Tube bought: [\d.]+ kg/);
  });
});
