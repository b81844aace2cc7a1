// Units: exact conversions (F-UNIT-1), printed-vs-exact sizes (F-UNIT-2), formatting and parsing.
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import {
  DIMENSIONS, DEFAULT_UNIT, UNITS, atLeast, atMost, formatQuantity, fromCanonical, inToMm, kgToLb, lbToKg, mmToIn, nearlyEqual,
  parseQuantity, toCanonical,
} from '@backend/domain/units';

describe('exact conversions', () => {
  test.each([
    // F-UNIT-1 (Ashmore & Allen data sheet): 1 in = 25.4 mm exactly; 1 in² = 645.16 mm² = 6.4516 cm²
    [1, 'in', 25.4],
    [1, 'in2', 645.16],
    [6.4516, 'cm2', 645.16],
    [1, 'lb', 0.45359237],
    [1, 'ft', 304.8],
  ])('%d %s = %d canonical', (value, unit, canonical) => {
    expect(toCanonical(value, unit)).toBeCloseTo(canonical, 9);
  });

  test('1 lb/ft = 1.4882 kg/m (F-UNIT-1)', () => {
    expect(toCanonical(1, 'lb/ft')).toBeCloseTo(1.4882, 4);
  });

  test.each([
    // F-UNIT-2 (derived): exact values of the rule-printed sizes
    [45, 'mm', 1.772, 'in'],
    [2.5, 'mm', 0.0984, 'in'],
    [1.75, 'in', 44.45, 'mm'],
    [0.095, 'in', 2.413, 'mm'],
    [1.625, 'in', 41.28, 'mm'],
    [0.118, 'in', 3.0, 'mm'],
    [0.083, 'in', 2.11, 'mm'],
    [0.12, 'in', 3.05, 'mm'],
    [120, 'cm2', 18.6, 'in2'],
    [60, 'cm2', 9.3, 'in2'],
  ])('%d %s ≈ %d %s (F-UNIT-2)', (value, from, expected, to) => {
    const got = fromCanonical(toCanonical(value, from), to);
    const decimals = String(expected).split('.')[1]?.length ?? 0;
    expect(Math.abs(got - expected)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12);
  });

  test('6 in × 6 in = 232 cm² (F-UNIT-2)', () => {
    expect(fromCanonical(inToMm(6) * inToMm(6), 'cm2')).toBeCloseTo(232.26, 2);
  });

  test('unknown unit is an error', () => {
    expect(() => toCanonical(1, 'furlong')).toThrow(/Unknown unit/);
  });
});

describe('round trips (property)', () => {
  const units = Object.keys(UNITS);
  test('toCanonical then fromCanonical returns the value', () => {
    fc.assert(
      fc.property(fc.constantFrom(...units), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (unit, v) => {
        const back = fromCanonical(toCanonical(v, unit), unit);
        expect(Math.abs(back - v)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(v)));
      }),
    );
  });
  test('inches and pounds round trip', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e5, noNaN: true }), (v) => {
        expect(mmToIn(inToMm(v))).toBeCloseTo(v, 9);
        expect(kgToLb(lbToKg(v))).toBeCloseTo(v, 6);
      }),
    );
  });
  test('format then parse gives the value back to display precision', () => {
    fc.assert(
      fc.property(fc.constantFrom<'imperial' | 'metric'>('imperial', 'metric'), fc.double({ min: 1, max: 300, noNaN: true }), (system, mm) => {
        const f = formatQuantity(mm, 'length', system);
        const parsed = parseQuantity(f.text, 'length', 'mm', system);
        expect(parsed.ok).toBe(true);
        if (parsed.ok) expect(Math.abs(parsed.valueCanonical - mm)).toBeLessThanOrEqual(toCanonical(0.5 * 10 ** -f.decimals, f.unit) + 1e-9);
      }),
    );
  });
});

describe('formatQuantity', () => {
  test.each([
    [38.1, 'length', 'imperial', '1.500 in'],
    [2.413, 'length', 'imperial', '0.095 in'],
    [45, 'length', 'metric', '45.0 mm'],
    [2.5, 'length', 'metric', '2.50 mm'],
    [6000, 'area', 'metric', '60.0 cm²'],
    [333.8, 'area', 'metric', '334 mm²'],
    [30, 'angle', 'metric', '30.0°'],
    [0.92, 'ratio', 'imperial', '0.92'],
    [2.62, 'mass_per_length', 'metric', '2.620 kg/m'],
    [lbToKg(2400), 'mass', 'imperial', '2400 lb'],
  ] as const)('%d %s in %s → %s', (value, dimension, system, text) => {
    expect(formatQuantity(value, dimension, system).text).toBe(text);
  });
  test('every dimension has a default unit in both systems', () => {
    for (const d of DIMENSIONS) for (const s of ['imperial', 'metric'] as const) expect(UNITS[DEFAULT_UNIT[s][d]].dimension).toBe(d);
  });
  test('a forced unit of the wrong dimension is refused', () => {
    expect(() => formatQuantity(1, 'length', 'metric', { unit: 'kg' })).toThrow();
  });
});

describe('parse helpers for form inputs', () => {
  test.each([
    ['1.75 in', 44.45], ['1.75in', 44.45], ['1-3/4"', 44.45], ['45 mm', 45], ['45', 45], ['4.5 cm', 45],
  ])('parseQuantity(%s) = %d mm', (text, mm) => {
    const r = parseQuantity(text, 'length', 'mm', 'metric');
    expect(r).toEqual({ ok: true, valueCanonical: expect.closeTo(mm, 9) });
  });
  test('wrong dimension and unknown units give a clear message', () => {
    expect(parseQuantity('45 kg', 'length', 'mm', 'metric')).toEqual({ ok: false, message: '"kg" is not a unit of length.' });
    expect(parseQuantity('45 furlong', 'length', 'mm', 'metric')).toEqual({ ok: false, message: 'Unknown unit "furlong".' });
    expect(parseQuantity('', 'length', 'mm', 'metric')).toEqual({ ok: false, message: 'Enter a value.' });
  });
});

describe('tolerant comparisons', () => {
  test('conversion noise does not flip a limit', () => {
    // 1.5 in = 38.1 mm; 3 × OD computed in floating point must still count as "at least 3 × OD"
    expect(atLeast(inToMm(1.5), 38.1)).toBe(true);
    expect(atLeast(0.1 + 0.2, 0.3)).toBe(true);
    expect(atMost(0.1 + 0.2, 0.3)).toBe(true);
  });
  test('a stated tolerance widens the limit, and only by that much', () => {
    expect(atLeast(44.96, 45, 0.05)).toBe(true);
    expect(atLeast(44.94, 45, 0.05)).toBe(false);
    expect(nearlyEqual(3.04, 3, 0.05)).toBe(true);
    expect(nearlyEqual(3.06, 3, 0.05)).toBe(false);
  });
});
