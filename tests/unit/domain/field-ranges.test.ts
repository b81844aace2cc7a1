// Plausible ranges per field (issue 9 §1): each field its own range, said in the builder's units in
// the browser and in both systems on the server, applied to every number of a specification by path.
import { describe, expect, test } from 'vitest';
import { FIELD_RANGES, implausibleValues, inRange, rangeForPath, rangeMessage, rangeMessageBothSystems } from '@backend/domain/field-ranges';
import { DIMENSIONS, lbToKg } from '@backend/domain/units';

describe('the registry', () => {
  test.each([
    ['vehicle.weightWithDriverKg', 'mass', 200, 5000],
    ['members.12.odMm', 'length', 10, 120],
    ['members.0.wallMm', 'length', 0.5, 10],
    ['members.3.wallReadings.7.wallMm', 'length', 0.3, 10],
    ['members.0.lengthMm', 'length', 50, 6000],
    ['members.0.yieldMpa', 'stress', 150, 1500],
    ['plates.2.sidesMm.1', 'length', 10, 1000],
  ] as const)('%s is a %s from %d to %d', (path, dimension, min, max) => {
    expect(rangeForPath(path)).toMatchObject({ dimension, min, max });
  });

  test('ranges belong to fields: a wall, an OD and a member length are all lengths with different ranges', () => {
    const [wall, od, length] = ['members.0.wallMm', 'members.0.odMm', 'members.0.lengthMm'].map((p) => rangeForPath(p)!);
    expect(new Set([wall.dimension, od.dimension, length.dimension])).toEqual(new Set(['length']));
    expect(new Set([wall.max, od.max, length.max]).size).toBe(3);
  });

  test('paths that only look alike, and fields without a range, have none', () => {
    expect(rangeForPath('members.x.odMm')).toBeUndefined();
    expect(rangeForPath('members.0.odMmExtra')).toBeUndefined();
    expect(rangeForPath('plates.0.boltCount')).toBeUndefined();
  });

  test('every range is well formed', () => {
    for (const [key, r] of Object.entries(FIELD_RANGES)) {
      expect(DIMENSIONS, key).toContain(r.dimension);
      expect(r.min, key).toBeLessThan(r.max);
    }
  });
});

describe('messages', () => {
  const weight = rangeForPath('vehicle.weightWithoutDriverKg')!;
  test.each([
    ['metric', "A race car's weight is 200 to 5,000 kg: check the units."],
    // 200 kg = 440.9 lb and 5,000 kg = 11,023.1 lb (F-UNIT-1, 1 lb = 0.45359237 kg; computed)
    ['imperial', "A race car's weight is 441 to 11,023 lb: check the units."],
  ] as const)('in %s', (system, message) => expect(rangeMessage(weight, system)).toBe(message));
  test('the server names both systems; a unitless or same-unit range once', () => {
    expect(rangeMessageBothSystems(weight)).toBe("A race car's weight is 200 to 5,000 kg (441 to 11,023 lb): check the units.");
    expect(rangeMessageBothSystems(rangeForPath('geometry.rearBraceAngleFromVerticalDeg')!)).toBe("A brace's angle from vertical is 0 to 90°: check the units.");
    expect(rangeMessage(rangeForPath('geometry.hoopAboveHelmetMm')!, 'metric')).toBe('The hoop top above the helmet is −500 to 1,000 mm: check the units.');
  });
});

describe('a whole specification', () => {
  test('2.8 lb (the "2,800" slip) and a wall typed as its OD are each found at their path', () => {
    const spec = {
      vehicle: { classId: 'c', weightWithoutDriverKg: lbToKg(2.8) },
      members: [
        { id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 2.413 },
        { id: 'fh', kind: 'front_hoop', odMm: 44.45, wallMm: 44.45 / 2.5, wallReadings: [{ wallMm: 2.4, method: 'sonic' }] },
      ],
    };
    expect(implausibleValues(spec)).toEqual([
      { path: 'vehicle.weightWithoutDriverKg', message: "A race car's weight is 200 to 5,000 kg (441 to 11,023 lb): check the units." },
      { path: 'members.1.wallMm', message: "A cage tube's wall is 0.5 to 10 mm (0.02 to 0.394 in): check the units." },
    ]);
  });
  test('the bounds themselves are plausible, and a converted bound is not refused by rounding noise', () => {
    const weight = rangeForPath('vehicle.weightWithDriverKg')!;
    expect(inRange(200, weight)).toBe(true);
    expect(inRange(5000, weight)).toBe(true);
    expect(inRange(199.99, weight)).toBe(false);
    expect(inRange(0.5 * (1 + 1e-12), rangeForPath('members.0.wallMm')!)).toBe(true);
  });
});
