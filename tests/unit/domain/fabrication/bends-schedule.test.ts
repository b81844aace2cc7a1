// Bend arithmetic against the shop formulas' worked example, springback calibration, and the cut and
// bend schedule of a member read as corner-to-corner legs.
import { describe, expect, test } from 'vitest';
import { angleToSet, bendArithmetic, springbackProblems } from '@backend/domain/fabrication/bends';
import { planMember, planProblems, PlanInputError, type MemberPlanInput } from '@backend/domain/fabrication/cut-schedule';

const IN = 25.4;

describe('bend arithmetic (common shop formulas: arc = CLR·θ, setback = CLR·tan(θ/2), gain = 2·setback − arc)', () => {
  test('90° at CLR 5.25 in → arc 8.247 in, setback 5.25 in, gain 2.253 in (issue 11 worked example)', () => {
    const b = bendArithmetic(90, 5.25 * IN);
    expect(b.arcMm / IN).toBeCloseTo(8.247, 3);
    expect(b.setbackMm / IN).toBeCloseTo(5.25, 9);
    expect(b.gainMm / IN).toBeCloseTo(2.253, 3);
  });
  test('45° at CLR 135 mm (3 × 45 mm, F-MSUK-G4): setback 135·tan 22.5° = 55.92 mm (computed)', () => {
    expect(bendArithmetic(45, 135).setbackMm).toBeCloseTo(55.919, 3);
  });
});

describe('springback, calibrated once per die', () => {
  test('set 92°, held 90° → a 45° bend is set at 46°', () => {
    expect(angleToSet(45, { setDeg: 92, heldDeg: 90 })).toBeCloseTo(46, 9);
    expect(angleToSet(45, null)).toBe(45);
  });
  test.each([
    [{ setDeg: 88, heldDeg: 90 }, 'heldDeg', /negative springback/],
    [{ setDeg: 120, heldDeg: 90 }, 'heldDeg', /more than a quarter/],
    [{ setDeg: -5, heldDeg: 90 }, 'setDeg', /more than 0°/],
    [{ setDeg: 90, heldDeg: 0 }, 'heldDeg', /more than 0°/],
  ])('refuses %o at %s', (cal, field, message) => {
    const p = springbackProblems(cal);
    expect(p[0]!.field).toBe(field);
    expect(p[0]!.message).toMatch(message);
  });
});

// A hoop drawn as feet → corners → feet: legs 1000, 1200 (across the top), 1000 mm, two 90° bends at CLR 150.
const hoop: MemberPlanInput = {
  legsMm: [1000, 1200, 1000],
  bends: [{ angleDeg: 90, clrMm: 150 }, { angleDeg: 90, clrMm: 150 }],
  rotationsDeg: [0],
  endLossMm: [0, 0],
  trimMm: [25, 25],
};

describe('cut and bend schedule', () => {
  test('developed length is the straights less setbacks plus the arcs (computed)', () => {
    const plan = planMember(hoop);
    const arc = (150 * Math.PI) / 2;
    expect(plan.developedLengthMm).toBeCloseTo(3200 - 4 * 150 + 2 * arc, 9);
    expect(plan.cutLengthMm).toBeCloseTo(plan.developedLengthMm + 50, 9);
  });
  test('marks run from the tube’s start (trim included) to each bend’s tangent point', () => {
    const plan = planMember(hoop);
    const arc = (150 * Math.PI) / 2;
    expect(plan.bends[0]!.markMm).toBeCloseTo(25 + 850, 9);
    expect(plan.bends[0]!.centreMarkMm).toBeCloseTo(25 + 850 + arc / 2, 9);
    expect(plan.bends[1]!.markMm).toBeCloseTo(25 + 850 + arc + 900, 9);
    expect(plan.bends[0]!.rotationToNextDeg).toBe(0);
    expect(plan.bends[1]!.rotationToNextDeg).toBeNull();
    expect(plan.straightBeforeFirstMm).toBeCloseTo(875, 9);
    expect(plan.straightAfterLastMm).toBeCloseTo(850 + 25, 9);
  });
  test('a coped end shortens the cut by what the cope loses; marks move with the start', () => {
    const plan = planMember({ ...hoop, endLossMm: [10, 4] });
    expect(plan.cutLengthMm).toBeCloseTo(planMember(hoop).cutLengthMm - 14, 9);
    expect(plan.bends[0]!.markMm).toBeCloseTo(875 - 10, 9);
  });
  test('a die calibrated for the CLR sets each bend past its angle', () => {
    const plan = planMember(hoop, [{ name: '150 mm die', clrMm: 150, calibration: { setDeg: 93, heldDeg: 90 } }, { name: 'other', clrMm: 120, calibration: { setDeg: 95, heldDeg: 90 } }]);
    expect(plan.bends[0]!.setDeg).toBeCloseTo(93, 9);
    expect(plan.bends[0]!.dieName).toBe('150 mm die');
  });
  test('a straight brace: no bends, everything is straight', () => {
    const plan = planMember({ legsMm: [1238.95], bends: [], rotationsDeg: [], endLossMm: [12, 12], trimMm: [3, 3] });
    expect(plan.bends).toEqual([]);
    expect(plan.cutLengthMm).toBeCloseTo(1238.95 - 24 + 6, 9);
    expect(plan.straightBeforeFirstMm).toBeCloseTo(plan.cutLengthMm, 9);
    expect(plan.straightAfterLastMm).toBeCloseTo(plan.cutLengthMm, 9);
  });
  test.each([
    [{ trimMm: [-1, 0] as [number, number] }, 'trimMm.0', /negative/],
    [{ trimMm: [0, 500] as [number, number] }, 'trimMm.1', /not an allowance/],
    [{ legsMm: [1000, 250, 1000] }, 'legsMm.1', /bends overlap/],
    [{ legsMm: [1000, 0, 1000] }, 'legsMm.1', /longer than zero/],
  ])('refuses %o at %s', (change, path, message) => {
    const input = { ...hoop, ...change };
    const p = planProblems(input);
    expect(p.map((x) => x.path)).toContain(path);
    expect(p.find((x) => x.path === path)!.message).toMatch(message);
    expect(() => planMember(input)).toThrow(PlanInputError);
  });
});
