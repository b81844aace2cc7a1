// Geometry facts derived from the model, and the published geometry cases driven from coordinates
// instead of typed measurements. Expected values are computed by hand from the fixture's
// coordinates (the arithmetic is written beside each), not read back from the code.
import { describe, expect, test } from 'vitest';
import { deriveCageGeometry } from '@backend/domain/geometry/index';
import { IN, check, compileFile, finding } from '../helpers';
import { cageSpec } from '../../../fixtures/cage-model';

const msuk = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json');
const nhra = compileFile('tests/fixtures/rulesets/nhra-quoted.json');
const deg = (rad: number) => (rad * 180) / Math.PI;

describe('facts from the fixture cage', () => {
  const facts = deriveCageGeometry(cageSpec()).facts;
  test('braces: top surface 1150 + 45/2 = 1172.5; junction at z 1000', () => {
    expect(facts['geometry.rearBraceAttachBelowTopMm']?.value).toBeCloseTo(172.5, 9);
    // Brace (0, 600, 1000) → (−900, 550, 300): acos(700 / √(900² + 50² + 700²)) = 52.16°.
    const expected = deg(Math.acos(700 / Math.hypot(900, 50, 700)));
    expect(facts['geometry.rearBraceAngleFromVerticalDeg']?.value).toBeCloseTo(expected, 9);
    // Vertical legs: the included angle with the hoop's downward leg is the same angle.
    expect(facts['geometry.rearBraceIncludedAngleDeg']?.value).toBeCloseTo(expected, 9);
    expect(facts['geometry.rearBraceAngleFromVerticalDeg']?.members).toEqual(['backstay left']);
  });
  test('inside width at the feet: centreline 1200 less one OD of 45 = 1155', () => {
    expect(facts['geometry.mainHoopInsideWidthMm']).toEqual({ value: 1155, members: ['main hoop'] });
  });
  test('harness bar: shoulders 900 − (bar centreline 800 + OD 38/2) = 81 below', () => {
    expect(facts['geometry.harnessBarBelowShouldersMm']?.value).toBeCloseTo(81, 9);
  });
  test('diagonal from the right foot to the left backstay junction: both ends on their nodes', () => {
    expect(facts['geometry.diagonalLowerEndFromNodeMm']?.value).toBe(0);
    expect(facts['geometry.diagonalUpperEndFromNodeMm']?.value).toBe(0);
  });
  test('helmet (250, −300, 900) r 150: above, behind, nearest tube', () => {
    expect(facts['geometry.hoopAboveHelmetMm']?.value).toBeCloseTo(1172.5 - 1050, 9);
    // Back of helmet x = 100; hoop front surface at x = 22.5.
    expect(facts['geometry.hoopBehindHelmetMm']?.value).toBeCloseTo(77.5, 9);
    // Nearest is the harness bar (y from −600 to 600 at z 800): √(250² + 100²) − 150 − 19.
    expect(facts['geometry.nearestTubeToHelmetMm']).toEqual({ value: expect.closeTo(Math.hypot(250, 100) - 169, 9), members: ['harness bar'] });
    expect(facts['geometry.helmetBelowHoopLineMm']).toBeUndefined(); // no front hoop or halo
  });
  test('a fact about the braces is not derived while one brace has no path', () => {
    const s = cageSpec();
    delete (s.members[2] as { path?: unknown }).path;
    const f = deriveCageGeometry(s).facts;
    expect(f['geometry.rearBraceAngleFromVerticalDeg']).toBeUndefined();
    expect(f['geometry.nearestTubeToHelmetMm']).toBeUndefined();
    expect(f['geometry.mainHoopInsideWidthMm']?.value).toBe(1155);
  });
  test('helmet below the line joining the hoop tops, with a front hoop added', () => {
    const s = cageSpec();
    s.model.nodes.push(
      { id: 'ffl', role: 'foot', xMm: 1200, yMm: 650, zMm: 0 }, { id: 'ftl', role: 'bend', xMm: 1000, yMm: 600, zMm: 1000 },
      { id: 'ftr', role: 'bend', xMm: 1000, yMm: -600, zMm: 1000 }, { id: 'ffr', role: 'foot', xMm: 1200, yMm: -650, zMm: 0 },
    );
    s.members.push({ id: 'fh', kind: 'front_hoop', label: 'front hoop', odMm: 45, wallMm: 2.5,
      path: [{ nodeId: 'ffl' }, { nodeId: 'ftl', clrMm: 150 }, { nodeId: 'ftr', clrMm: 150 }, { nodeId: 'ffr' }] });
    const f = deriveCageGeometry(s).facts;
    // Tops (x 0, z 1172.5) and (x 1000, z 1022.5): slope −0.15. Perpendicular distance of the helmet
    // centre (250, 900) below the line: (line z at 250 − 900) · cos(atan 0.15), less the radius.
    const lineZ = 1172.5 - 0.15 * 250;
    const expected = (lineZ - 900) / Math.hypot(1, 0.15) - 150;
    expect(f['geometry.helmetBelowHoopLineMm']?.value).toBeCloseTo(expected, 6);
    expect(f['geometry.helmetBelowHoopLineMm']?.members).toEqual(['main hoop', 'front hoop']);
  });
});

const nhraSpec = (attachBelowTopIn: number) => {
  // CLR 90 at the corners lets the junction sit up to 1150 − 90 = 1060 (a 112.5 mm drop).
  const s = cageSpec({ clrMm: 90, braceJunctionZ: 1172.5 - attachBelowTopIn * IN });
  return { ...s, vehicle: { ...s.vehicle, classId: 'roll_bar' } };
};

describe('F-NHRA-G1 (GR 4.10, quoted secondhand): rear braces meet the hoop ≤ 5 in from its top, from coordinates', () => {
  test.each([
    [4.5, 'pass'],
    [5.5, 'fail'],
  ])('TC-18: braces %d in below the top → %s', async (inches, verdict) => {
    const r = await check(nhra, nhraSpec(inches));
    const f = finding(r, 'nhra-geometry');
    expect(f.verdict).toBe(verdict);
    const m = f.measured.find((x) => x.fact === 'geometry.rearBraceAttachBelowTopMm')!;
    expect(m.value).toBeCloseTo(inches * IN, 6);
    expect(m.source).toBe('model');
    expect(f.reason).toContain('From the model');
  });
});

const msukSpec = (angleDeg: number, diagonalLowerMm = 0) => {
  // Backstay foot straight behind the junction: dz 700, dx = 700·tan θ, dy 0.
  const s = cageSpec();
  for (const id of ['bl', 'br']) {
    const n = s.model.nodes.find((x) => x.id === id)!;
    n.xMm = -700 * Math.tan((angleDeg * Math.PI) / 180);
    n.yMm = Math.sign(n.yMm) * 600;
  }
  if (diagonalLowerMm > 0) {
    s.model.nodes.push({ id: 'dr', label: 'diagonal foot', role: 'junction', xMm: 0, yMm: -600, zMm: diagonalLowerMm });
    const hoop = s.members[0];
    hoop.path.splice(hoop.path.length - 1, 0, { nodeId: 'dr' });
    s.members[4].path = [{ nodeId: 'dr' }, { nodeId: 'jl' }];
  }
  return s;
};

describe('Motorsport UK NCR 2026 geometry from coordinates (source: ebooks.motorsportuk.org p. 251–256)', () => {
  test.each([
    [35, 'pass'],
    [25, 'fail'],
  ])('TC-15 (F-MSUK-G1): backstays built at %d° from vertical → %s', async (angle, verdict) => {
    const r = await check(msuk, msukSpec(angle));
    const f = finding(r, 'msuk-backstays');
    expect(f.verdict).toBe(verdict);
    expect(f.measured.find((x) => x.fact === 'geometry.rearBraceAngleFromVerticalDeg')?.value).toBeCloseTo(angle, 9);
  });
  test.each([
    [80, 'pass'],
    [120, 'fail'],
  ])('F-MSUK-G2: diagonal lower end %d mm up the leg from the foot → %s', async (mm, verdict) => {
    const r = await check(msuk, msukSpec(35, mm));
    const f = finding(r, 'msuk-diagonal');
    expect(f.verdict).toBe(verdict);
    expect(f.measured.find((x) => x.fact === 'geometry.diagonalLowerEndFromNodeMm')?.value).toBeCloseTo(mm, 9);
  });
});

describe('a typed value beside the model: the less favourable decides, a disagreement is advisory', () => {
  const withTyped = (modelDeg: number, typedDeg: number) => ({ ...msukSpec(modelDeg), geometry: { rearBraceAngleFromVerticalDeg: typedDeg } });
  test('model 25°, sheet 35°: fails on the model, and says they disagree', async () => {
    const r = await check(msuk, withTyped(25, 35));
    const all = r.findings.filter((x) => x.requirementId === 'msuk-backstays');
    expect(all.map((x) => [x.severity, x.verdict])).toEqual([['mandatory', 'fail'], ['advisory', 'fail']]);
    expect(all[1].reason).toBe('The model gives 25.0°, the sheet says 35.0° for the rear brace angle from vertical (they should agree within 2.0°). The less favourable of the two decides; check the measurement or the model.');
    expect(r.geometry?.disagreements.map((d) => d.fact)).toEqual(['geometry.rearBraceAngleFromVerticalDeg']);
    expect(r.verdict).toBe('fail');
  });
  test('model 35°, sheet 25°: the typed value is less favourable and decides', async () => {
    const r = await check(msuk, withTyped(35, 25));
    const f = finding(r, 'msuk-backstays');
    expect(f.verdict).toBe('fail');
    expect(f.measured.find((x) => x.fact === 'geometry.rearBraceAngleFromVerticalDeg')).toEqual(expect.objectContaining({ value: 25 }));
    expect(f.measured[0].source).toBeUndefined();
  });
  test('model 35°, sheet 36° agree within 2°: pass, no advisory', async () => {
    const r = await check(msuk, withTyped(35, 36));
    expect(r.findings.filter((x) => x.requirementId === 'msuk-backstays').map((x) => x.verdict)).toEqual(['pass']);
    expect(r.geometry?.disagreements).toEqual([]);
  });
  test('member length from the model, typed length compared', async () => {
    const s = { ...cageSpec(), members: cageSpec().members.map((m) => (m.id === 'hb' ? { ...m, lengthMm: 1100 } : m)) };
    const r = await check(msuk, s);
    expect(r.tubes.members.find((t) => t.memberId === 'hb')?.lengthMm).toBe(1200);
    expect(r.geometry?.disagreements).toEqual([expect.objectContaining({ fact: 'member.lengthMm', memberId: 'hb', modelValue: 1200, sheetValue: 1100 })]);
    expect(r.geometry?.members.find((m) => m.memberId === 'bsl')).toEqual(expect.objectContaining({ name: 'backstay left', side: 'left', driverSide: 'passenger' }));
  });
  test('findings name members by the builder’s name', async () => {
    const r = await check(msuk, cageSpec());
    expect(r.findings.find((x) => x.member?.id === 'bsl')?.member?.name).toBe('backstay left');
  });
});
