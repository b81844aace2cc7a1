// Fabrication routes: the cope and its template PDF, and the hoop leg trim. Signed-in users only; bad
// input is a 400 at its field and never a drawing or a PDF.
import { execFileSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { agentFor, demo, makeTestApp, signIn, useTestDatabase, type Agent } from './helpers';

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
