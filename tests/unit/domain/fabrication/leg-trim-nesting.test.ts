// Hoop leg trim (trigonometry of a leaning plane; computed) and the buying list (first-fit-decreasing
// nesting, masses against F-ENG-2 and F-ENG-4).
import { describe, expect, test } from 'vitest';
import { computeLegTrim, legTrimProblems, legTrimSideViewSvg, type LegTrimInput } from '@backend/domain/fabrication/leg-trim';
import { buyingList, buyingListCsv, nestPieces, nestingProblems } from '@backend/domain/fabrication/nesting';
import { fromCanonical } from '@backend/domain/units';

const IN = 25.4;
const base: LegTrimInput = { legs: [{ uncutMm: 1250, padHeightMm: 0 }, { uncutMm: 1250, padHeightMm: 12 }], leanDeg: 10, odMm: 44.45 };

describe('hoop leg trim', () => {
  test('uneven pads: each leg lands on its pad and the top is level at the lean (computed)', () => {
    const t = computeLegTrim(base);
    const cos = Math.cos((10 * Math.PI) / 180);
    // The left pad is lower, so the left leg at its full length sets the top; the right leg is cut.
    expect(t.topHeightMm).toBeCloseTo(1250 * cos, 9);
    expect(t.legs[0].trimMm).toBeCloseTo(0, 9);
    expect(t.legs[1].cutHeightMm).toBeCloseTo((1250 * cos - 12) / cos, 9);
    expect(t.legs[1].trimMm).toBeCloseTo(12 / cos, 9);
    // Both feet reach their pads: top − h·cos(lean) = pad.
    t.legs.forEach((l) => expect(t.topHeightMm - l.cutHeightMm * cos).toBeCloseTo(l.padHeightMm, 9));
    expect(t.footBevelDeg).toBe(10);
    expect(t.topSurfaceHeightMm).toBeCloseTo(t.topHeightMm + 22.225, 9);
  });
  test('an upright hoop on level pads with a chosen top height cuts both legs alike', () => {
    const t = computeLegTrim({ ...base, leanDeg: 0, legs: [{ uncutMm: 1250, padHeightMm: 0 }, { uncutMm: 1250, padHeightMm: 0 }], topHeightMm: 1200 });
    expect(t.legs[0].trimMm).toBeCloseTo(50, 9);
    expect(t.legs[1].trimMm).toBeCloseTo(50, 9);
  });
  test('refuses a pad the leg cannot reach', () => {
    const p = legTrimProblems({ ...base, topHeightMm: 1300 });
    expect(p.map((x) => x.path)).toEqual(['legs.0.padHeightMm', 'legs.1.padHeightMm']);
    expect(p[0]!.message).toMatch(/cannot reach this pad/);
    expect(() => computeLegTrim({ ...base, topHeightMm: 1300 })).toThrow();
  });
  test('refuses a pad so high the cut would go into the bend', () => {
    const p = legTrimProblems({ ...base, legs: [{ uncutMm: 1250, padHeightMm: 200, bendEndMm: 1100 }, { uncutMm: 1250, padHeightMm: 0 }] });
    expect(p[0]!.path).toBe('legs.0.padHeightMm');
    expect(p[0]!.message).toMatch(/into the leg's bend/);
  });
  test('refuses an absurd lean', () => {
    expect(legTrimProblems({ ...base, leanDeg: 75 })[0]!.path).toBe('leanDeg');
  });
  test('the side view is one SVG with presentation attributes only', () => {
    const svg = legTrimSideViewSvg(computeLegTrim(base), 44.45);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).not.toMatch(/class=|style=/);
    expect(svg).toContain('left pad 0 mm');
    expect(svg).toContain('right pad 12 mm');
  });
});

describe('buying list', () => {
  const p = (label: string, lengthMm: number) => ({ memberId: label, label, lengthMm });
  test('first-fit-decreasing with a kerf between pieces, offcuts listed', () => {
    const { sticks, tooLong } = nestPieces([p('a', 2000), p('b', 3000), p('c', 2998), p('d', 1000), p('e', 4000)], { stickLengthMm: 6000, kerfMm: 2 });
    expect(tooLong).toEqual([]);
    // Decreasing: e 4000, b 3000, c 2998, a 2000, d 1000. a needs 2000 + 2 kerf beside e, so it opens a
    // third stick; d then fits beside e.
    expect(sticks.map((s) => s.pieces.map((x) => x.label))).toEqual([['e', 'd'], ['b', 'c'], ['a']]);
    expect(sticks.map((s) => s.offcutMm)).toEqual([6000 - 4000 - 1002, 0, 4000]);
  });
  test('a piece longer than a stick is listed, not nested', () => {
    expect(nestPieces([p('long', 6500)], { stickLengthMm: 6000, kerfMm: 2 }).tooLong.map((x) => x.label)).toEqual(['long']);
  });
  test('masses: tube bought by the stick (F-ENG-2 lb/ft = 10.68·(OD − t)·t; F-ENG-4 1.750 × 0.120 → 2.089 lb/ft) and plates', () => {
    const list = buyingList([{ odMm: 1.75 * IN, wallMm: 0.12 * IN, material: 'mild_steel', pieces: [p('a', 1000)] }], [{ id: 'pl', thicknessMm: 3, areaMm2: 12000 }, { id: 'nosize' }], { stickLengthMm: 20 * 12 * IN, kerfMm: 2 });
    const lbPerFt = fromCanonical(list.groups[0]!.massPerMetreKg, 'lb/ft');
    expect(Math.abs(lbPerFt - 10.68 * (1.75 - 0.12) * 0.12)).toBeLessThanOrEqual(0.005);
    expect(Math.abs(lbPerFt - 2.089)).toBeLessThanOrEqual(0.005);
    expect(fromCanonical(list.tubeMassKg, 'lb')).toBeCloseTo(lbPerFt * 20, 6);
    // 3 mm × 120 cm² of steel at 7.85 g/cm³ (F-ENG-6) = 36 cm³ → 282.6 g.
    expect(list.plateMassKg).toBeCloseTo(0.2826, 6);
    expect(list.platesWithoutSize).toEqual(['nosize']);
    expect(list.totalMassKg).toBeCloseTo(list.tubeMassKg + list.plateMassKg, 9);
  });
  test('CSV: one row per piece, labels kept as text', () => {
    const list = buyingList([{ odMm: 45, wallMm: 2.5, material: 'mild_steel', pieces: [p('=cmd', 1000), p('brace, left', 800)] }], [], { stickLengthMm: 6000, kerfMm: 2 });
    const csv = buyingListCsv(list, () => '45 × 2.5 mm');
    expect(csv).toContain("'=cmd");
    expect(csv).toContain('"brace, left"');
    expect(csv.split('\r\n')[0]).toBe('tube,material,stick,member,piece length (mm),offcut of stick (mm),mass per metre (kg/m)');
  });
  test.each([[{ stickLengthMm: 100, kerfMm: 2 }, 'stickLengthMm'], [{ stickLengthMm: 6000, kerfMm: -1 }, 'kerfMm'], [{ stickLengthMm: 6000, kerfMm: 50 }, 'kerfMm']])('refuses %o', (o, path) => {
    expect(nestingProblems(o)[0]!.path).toBe(path);
  });
});
