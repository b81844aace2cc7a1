// Tube section properties and mass per length against F-ENG-4 / F-ENG-5 (derived from F-ENG-1/2),
// with monotonicity properties and validation of absurd sizes.
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { bendRadiusRatio, odMarginOverMinimum, ovalityRatio, plateArea, plateLeastSide, tubeSectionProperties, tubeSizeProblems } from '@backend/domain/tube';
import { fromCanonical, inToMm } from '@backend/domain/units';

describe('F-ENG-4: imperial worked examples (derived from F-ENG-1/F-ENG-2)', () => {
  test.each([
    // OD in, wall in, A in², I in⁴, Z in³, lb/ft
    [1.5, 0.095, 0.4193, 0.1039, 0.1386, 1.426],
    [1.5, 0.12, 0.5202, 0.1248, 0.1664, 1.769],
    [1.625, 0.083, 0.4021, 0.1199, 0.1475, 1.367],
    [1.625, 0.118, 0.5587, 0.1596, 0.1964, 1.899],
    [1.75, 0.095, 0.4939, 0.1697, 0.1939, 1.679],
    [1.75, 0.12, 0.6145, 0.2052, 0.2345, 2.089],
    [1.5, 0.125, 0.54, 0.1287, 0.1716, 1.836],
  ])('%d × %d in', (od, wall, A, I, Z, lbPerFt) => {
    const p = tubeSectionProperties({ odMm: inToMm(od), wallMm: inToMm(wall) });
    expect(fromCanonical(p.areaMm2, 'in2')).toBeCloseTo(A, 3);
    expect(fromCanonical(p.secondMomentMm4, 'in4')).toBeCloseTo(I, 3);
    expect(fromCanonical(p.sectionModulusMm3, 'in3')).toBeCloseTo(Z, 3);
    // TC-28 tolerance ±0.005 lb/ft: F-ENG-4 uses 10.68 (0.2833 lb/in³), we use 7.85 g/cm³ (F-ENG-6, 0.2836)
    expect(Math.abs(fromCanonical(p.massPerMetreKg, 'lb/ft') - lbPerFt)).toBeLessThanOrEqual(0.005);
  });

  test('TC-29: 1.750 × 0.120 in → Z = 0.2345 in³ (F-ENG-1, F-ENG-4)', () => {
    const p = tubeSectionProperties({ odMm: inToMm(1.75), wallMm: inToMm(0.12) });
    expect(fromCanonical(p.sectionModulusMm3, 'in3')).toBeCloseTo(0.2345, 4);
  });
  test('TC-28: 1.500 × 0.095 → 1.426 lb/ft, 1.750 × 0.120 → 2.089 lb/ft (±0.005; F-ENG-2, F-ENG-4)', () => {
    expect(Math.abs(fromCanonical(tubeSectionProperties({ odMm: inToMm(1.5), wallMm: inToMm(0.095) }).massPerMetreKg, 'lb/ft') - 1.426)).toBeLessThanOrEqual(0.005);
    expect(Math.abs(fromCanonical(tubeSectionProperties({ odMm: inToMm(1.75), wallMm: inToMm(0.12) }).massPerMetreKg, 'lb/ft') - 2.089)).toBeLessThanOrEqual(0.005);
  });
  test('VVES T403 cross-check: 1-1/2 × 1/8 in A 0.540, I 0.129, Z 0.172 (F-ENG-4 b)', () => {
    const p = tubeSectionProperties({ odMm: inToMm(1.5), wallMm: inToMm(0.125) });
    expect(fromCanonical(p.areaMm2, 'in2')).toBeCloseTo(0.54, 3);
    expect(fromCanonical(p.secondMomentMm4, 'in4')).toBeCloseTo(0.129, 3);
    expect(fromCanonical(p.sectionModulusMm3, 'in3')).toBeCloseTo(0.172, 3);
  });
});

describe('F-ENG-5: metric FIA sizes (derived, ρ = 7.85 g/cm³)', () => {
  test.each([
    [45, 2.5, 333.8, 75625, 3361, 2.62],
    [50, 2.0, 301.6, 87010, 3480, 2.368],
    [38, 2.5, 278.8, 44140, 2323, 2.189],
    [40, 2.0, 238.8, 43216, 2161, 1.874],
    [38, 3.0, 329.9, 50882, 2678, 2.589],
    [44.45, 2.413, 318.7, 70622, 3178, 2.502],
  ])('%d × %d mm', (od, wall, A, I, Z, kgm) => {
    const p = tubeSectionProperties({ odMm: od, wallMm: wall });
    expect(p.areaMm2).toBeCloseTo(A, 0);
    // published to 5 significant figures: within 0.05 %
    expect(Math.abs(p.secondMomentMm4 - I) / I).toBeLessThan(5e-4);
    expect(Math.abs(p.sectionModulusMm3 - Z) / Z).toBeLessThan(5e-4);
    expect(p.massPerMetreKg).toBeCloseTo(kgm, 3);
  });
  test('TC-29: 45 × 2.5 mm → I = 75,625 mm⁴, Z = 3,361 mm³; TC-28: 2.620 kg/m', () => {
    const p = tubeSectionProperties({ odMm: 45, wallMm: 2.5 });
    expect(Math.round(p.secondMomentMm4)).toBe(75625);
    expect(Math.round(p.sectionModulusMm3)).toBe(3361);
    expect(p.massPerMetreKg).toBeCloseTo(2.62, 3);
  });
  test('F-ENG-5 note: 1.75 × 0.095 in has ~7 % less I and ~5 % less area than 45 × 2.5 mm', () => {
    const a = tubeSectionProperties({ odMm: 45, wallMm: 2.5 });
    const b = tubeSectionProperties({ odMm: inToMm(1.75), wallMm: inToMm(0.095) });
    expect(1 - b.secondMomentMm4 / a.secondMomentMm4).toBeCloseTo(0.066, 2);
    expect(1 - b.areaMm2 / a.areaMm2).toBeCloseTo(0.045, 2);
  });
  test('J = 2I and r = √(I/A) (F-ENG-1)', () => {
    const p = tubeSectionProperties({ odMm: 45, wallMm: 2.5 });
    expect(p.torsionalConstantMm4).toBeCloseTo(2 * p.secondMomentMm4, 6);
    expect(p.radiusOfGyrationMm).toBeCloseTo(Math.sqrt(p.secondMomentMm4 / p.areaMm2), 9);
  });
});

describe('monotonicity (property)', () => {
  const size = fc.record({ od: fc.double({ min: 10, max: 140, noNaN: true }), frac: fc.double({ min: 0.01, max: 0.45, noNaN: true }) });
  test('A, I, Z and mass grow with OD at fixed wall', () => {
    fc.assert(
      fc.property(size, fc.double({ min: 0.1, max: 20, noNaN: true }), ({ od, frac }, dOd) => {
        const wall = od * frac * 0.5;
        const a = tubeSectionProperties({ odMm: od, wallMm: wall });
        const b = tubeSectionProperties({ odMm: Math.min(od + dOd, 150), wallMm: wall });
        if (b.odMm === a.odMm) return;
        expect(b.areaMm2).toBeGreaterThan(a.areaMm2);
        expect(b.secondMomentMm4).toBeGreaterThan(a.secondMomentMm4);
        expect(b.sectionModulusMm3).toBeGreaterThan(a.sectionModulusMm3);
        expect(b.massPerMetreKg).toBeGreaterThan(a.massPerMetreKg);
      }),
    );
  });
  test('A, I, Z and mass grow with wall at fixed OD', () => {
    fc.assert(
      fc.property(size, fc.double({ min: 0.01, max: 0.9, noNaN: true }), ({ od, frac }, k) => {
        const w1 = od * frac * 0.5 * k;
        const w2 = od * frac * 0.5;
        if (!(w2 > w1)) return;
        const a = tubeSectionProperties({ odMm: od, wallMm: w1 });
        const b = tubeSectionProperties({ odMm: od, wallMm: w2 });
        expect(b.areaMm2).toBeGreaterThan(a.areaMm2);
        expect(b.secondMomentMm4).toBeGreaterThan(a.secondMomentMm4);
        expect(b.sectionModulusMm3).toBeGreaterThan(a.sectionModulusMm3);
        expect(b.massPerMetreKg).toBeGreaterThan(a.massPerMetreKg);
      }),
    );
  });
});

describe('tube measures', () => {
  test('TC-13 arithmetic: 45 mm tube with 135 mm CLR is exactly 3 × OD (F-MSUK-G4)', () => {
    expect(bendRadiusRatio(135, 45)).toBe(3);
    expect(bendRadiusRatio(120, 45)).toBeCloseTo(2.667, 3);
  });
  test('ovality is min over max, whichever order', () => {
    expect(ovalityRatio(40.5, 45)).toBeCloseTo(0.9, 12);
    expect(ovalityRatio(45, 40.5)).toBeCloseTo(0.9, 12);
  });
  test('plate area and least side; OD margin', () => {
    expect(plateArea({ sidesMm: [100, 60] })).toBe(6000);
    expect(plateArea({ sidesMm: [100, 60], areaMm2: 5500 })).toBe(5500);
    expect(plateLeastSide({ sidesMm: [100, 60] })).toBe(60);
    expect(odMarginOverMinimum(inToMm(2), inToMm(1.75))).toBeCloseTo(inToMm(0.25), 9);
  });
});

describe('absurd sizes are refused with clear messages', () => {
  test.each([
    [{ odMm: 45, wallMm: 22.5 }, 'wallMm', /half the outside diameter/],
    [{ odMm: 45, wallMm: 30 }, 'wallMm', /half the outside diameter/],
    [{ odMm: inToMm(40), wallMm: 2.5 }, 'odMm', /not a cage tube/],
    [{ odMm: 0, wallMm: 2.5 }, 'odMm', /positive/],
    [{ odMm: -45, wallMm: 2.5 }, 'odMm', /positive/],
    [{ odMm: 45, wallMm: 0 }, 'wallMm', /positive/],
    [{ odMm: Number.NaN, wallMm: 2 }, 'odMm', /positive/],
  ])('%o → %s', (size, field, message) => {
    const problems = tubeSizeProblems(size);
    expect(problems).toContainEqual({ field, message: expect.stringMatching(message) });
    expect(() => tubeSectionProperties(size)).toThrow(RangeError);
  });
  test('a plausible size has no problems', () => {
    expect(tubeSizeProblems({ odMm: 45, wallMm: 2.5 })).toEqual([]);
  });
});
