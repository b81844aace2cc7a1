// A build sheet's fabrication from its cage model: which ends are saddles (and which are not), cut
// lengths less what each coped end loses, the hoop's leg cut heights, and the buying list. Values
// are computed here independently where the geometry allows (chords, trigonometry).
import { describe, expect, test } from 'vitest';
import { computeCope } from '@backend/domain/fabrication/cope';
import { sheetFabrication } from '@backend/domain/fabrication/sheet-fabrication';
import { hl, hr, modelSpec } from '../../../fixtures/fabrication-model';

const settings = { dies: [{ name: '150 die', clrMm: 150, calibration: { setDeg: 93, heldDeg: 90 } }], trimAllowanceMm: 5, stickLengthMm: 6000, kerfMm: 2 };
const byId = (id: string) => sheetFabrication(modelSpec, settings).members.find((m) => m.memberId === id)!;

describe('ends', () => {
  test('a backstay meeting the hoop on its straight top is a saddle; its foot lands on a pad', () => {
    const bl = byId('bl');
    expect(bl.ends![0]).toMatchObject({ kind: 'saddle', runName: 'main hoop', cope: { branchOdMm: 38, runOdMm: 44.45, offsetMm: 0 } });
    expect(bl.ends![1]).toMatchObject({ kind: 'pad' });
    // The angle between the backstay and the top tube (along y): computed from the direction (−750, 200, −850).
    const d = [-750, 200, -850];
    const expected = (Math.acos(200 / Math.hypot(...d)) * 180) / Math.PI;
    const fit = bl.ends![0];
    if (fit.kind !== 'saddle') throw new Error('expected a saddle');
    expect(fit.cope.angleDeg).toBeCloseTo(Math.min(expected, 180 - expected), 2);
  });
  test('an end that meets a bend gets no template', () => {
    expect(byId('br').ends![0]).toMatchObject({ kind: 'not_a_saddle', reason: expect.stringContaining('at a bend: not a two-tube saddle') });
  });
  test('an end where three or more tubes meet gets no template', () => {
    expect(byId('dg').ends![1]).toMatchObject({ kind: 'not_a_saddle', reason: expect.stringContaining('Three or more tubes meet here') });
    expect(byId('rb').ends![0]).toMatchObject({ kind: 'not_a_saddle' });
    expect(byId('rb').ends![1]).toMatchObject({ kind: 'free' });
    expect(byId('dg').ends![0]).toMatchObject({ kind: 'saddle', runName: 'main hoop' });
  });
});

describe('cut lengths', () => {
  test('a straight bar coped at both ends: the chord less both copes’ losses plus both trims', () => {
    const hb = byId('hb');
    const chord = Math.hypot(hl.x - hr.x, hl.y - hr.y, hl.z - hr.z);
    const fit = hb.ends![0];
    if (fit.kind !== 'saddle') throw new Error('expected a saddle');
    const loss = computeCope(fit.cope).tipFromNodeMm;
    expect(hb.cutLengthMm).toBeCloseTo(chord - 2 * loss + 2 * 5, 6);
    // Both legs lean alike, so the two copes face the same way round the bar (computed).
    expect(hb.copeRotationDeg).toBeCloseTo(0, 6);
    expect(hb.rotationReference).toBe('start_cope');
  });
  test('the hoop: two bends with springback from the calibrated die, both feet on pads', () => {
    const mh = byId('mh');
    expect(mh.plan!.bends).toHaveLength(2);
    expect(mh.plan!.bends[0]!.setDeg).toBeCloseTo((mh.plan!.bends[0]!.angleDeg * 93) / 90, 9);
    expect(mh.ends!.map((e) => e.kind)).toEqual(['pad', 'pad']);
    expect(mh.cutLengthMm).toBeCloseTo(mh.plan!.developedLengthMm + 10, 9);
  });
  test('the hoop’s legs: lean from the model and the in-plane cut height to each pad', () => {
    const leg = byId('mh').legCut!;
    expect(leg.leanDeg).toBeCloseTo((Math.atan(150 / 1150) * 180) / Math.PI, 6);
    expect(leg.topHeightMm).toBeCloseTo(1150, 6);
    expect(leg.legs.map((l) => l.nodeId)).toEqual(['fl', 'fr']);
    for (const l of leg.legs) expect(l.cutHeightMm).toBeCloseTo(Math.hypot(150, 1150), 6);
  });
  test('measured pads decide the leg cuts, each leg to its own pad; a typed hoop gets them too; a brace never', () => {
    const lean = (Math.atan(150 / 1150) * 180) / Math.PI;
    const cos = Math.cos((lean * Math.PI) / 180);
    const measured = { mh: { legs: [{ uncutMm: 1170, padHeightMm: 6 }, { uncutMm: 1170, padHeightMm: -4 }] as [{ uncutMm: number; padHeightMm: number }, { uncutMm: number; padHeightMm: number }], leanDeg: lean }, bl: { legs: [{ uncutMm: 900, padHeightMm: 0 }, { uncutMm: 900, padHeightMm: 0 }] as [{ uncutMm: number; padHeightMm: number }, { uncutMm: number; padHeightMm: number }], leanDeg: 0 } };
    const fab = sheetFabrication(modelSpec, settings, measured);
    const mh = fab.members.find((m) => m.memberId === 'mh')!;
    // Top = min(6 + 1170·cos, −4 + 1170·cos) = 1170·cos − 4: the right (lower) pad's leg stays whole, the
    // left loses 10 / cos(lean) (computed: h = (T − P) / cos, docs/geometry.md).
    expect(mh.measuredLegs!.result!.topHeightMm).toBeCloseTo(1170 * cos - 4, 9);
    expect(mh.measuredLegs!.result!.legs.map((l) => l.trimMm)).toEqual([expect.closeTo(10 / cos, 9), expect.closeTo(0, 9)]);
    expect(mh.legCut).not.toBeNull();
    expect(fab.members.find((m) => m.memberId === 'bl')!.measuredLegs).toBeNull();
    const typed = sheetFabrication({ vehicle: { classId: 'x' }, members: [{ id: 'fh', kind: 'front_hoop', odMm: 38, wallMm: 2.5, lengthMm: 3000 }] }, settings, { fh: measured.mh });
    expect(typed.members[0]!.source).toBe('typed');
    expect(typed.members[0]!.measuredLegs!.result!.legs).toHaveLength(2);
    const unreachable = sheetFabrication(modelSpec, settings, { mh: { ...measured.mh, topHeightMm: 1400 } }).members.find((m) => m.memberId === 'mh')!;
    expect(unreachable.measuredLegs!.result).toBeNull();
    expect(unreachable.measuredLegs!.problems.map((p) => p.path)).toEqual(['legs.0.padHeightMm', 'legs.1.padHeightMm']);
  });
  test('typed members: the typed length plus trims; no length, no cut', () => {
    expect(byId('db')).toMatchObject({ source: 'typed', cutLengthMm: 1110 });
    expect(byId('gx')).toMatchObject({ source: 'none', cutLengthMm: null });
  });
});

describe('buying list', () => {
  test('groups by size, nests every cut piece, counts the plate', () => {
    const { buyingList } = sheetFabrication(modelSpec, settings);
    expect(buyingList.groups.map((g) => g.odMm)).toEqual([44.45, 38]);
    const pieces38 = buyingList.groups[1]!.sticks.flatMap((s) => s.pieces.map((p) => p.label)).sort();
    expect(pieces38).toEqual(['backstay left', 'backstay right', 'diagonal', 'door bar left', 'harness bar', 'roof bar']);
    expect(buyingList.plateMassKg).toBeCloseTo((3 * 12000 * 7.85) / 1e6, 9);
  });
});
