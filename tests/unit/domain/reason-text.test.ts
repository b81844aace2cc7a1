// Findings a steward would sign (issue 9 §4): a failing value never printed as its own limit, reasons
// written from stored parts in the reader's units (no mixed units), a failing tube finding that lists
// every size the band allows lightest first, a closing sentence on what to change, and passing
// findings that show the numbers they passed on.
import { describe, expect, test } from 'vitest';
import { comparisonText, findingReason, gapText, renderReason, tubeSizeText } from '@backend/domain/rules/reason-text';
import type { Dimension, UnitSystem } from '@backend/domain/units';
import { check, compileFile, finding, IN, LB } from './helpers';

describe('values are never rounded onto their limit', () => {
  test.each<[number, number, Dimension, UnitSystem, string]>([
    // The issue's own example: 2.496 mm against 2.50 mm printed "2.50 mm is under 2.50 mm" before.
    [2.496, 2.5, 'length', 'metric', '2.496 mm: 0.004 mm under 2.50 mm'],
    [0.8995, 0.9, 'ratio', 'metric', '0.8995: 0.0005 under 0.90'],
    // 0.0945 in = 2.4003 mm against 0.095 in = 2.413 mm (F-UNIT-1, computed)
    [0.0945 * IN, 0.095 * IN, 'length', 'imperial', '0.0945 in: 0.0005 in under 0.095 in'],
    // Values the usual digits already tell apart keep the usual form.
    [2.11, 2.41, 'length', 'metric', '2.11 mm (required at least 2.41 mm)'],
    [0, 3, 'count', 'metric', '0 (required at least 3)'],
  ])('%d against %d %s in %s → %s', (value, limit, d, system, text) => {
    expect(comparisonText(value, limit, d, 'atLeast', false, system)).toBe(text);
  });

  test('a shortfall in a tube size says how much when the digits would hide it', () => {
    expect(gapText(2.496, 2.5, 'length', 'metric')).toBe('2.496 mm is 0.004 mm under 2.50 mm');
    expect(gapText(0.065 * IN, 0.083 * IN, 'length', 'imperial')).toBe('0.065 in is under 0.083 in');
  });

  test('a pass shows the value and the limit it met', () => {
    expect(comparisonText(2.54, 2.41, 'length', 'atLeast', true, 'metric')).toBe('2.54 mm (at least 2.41 mm)');
  });

  test('tube sizes in either system', () => {
    expect(tubeSizeText(44.45, 2.413, 'imperial')).toBe('1.750 × 0.095 in'); // F-UNIT-1: 1.75 in = 44.45 mm
    expect(tubeSizeText(44.45, 2.413, 'metric')).toBe('44.45 × 2.41 mm');
    expect(tubeSizeText(45, 2.5, 'metric')).toBe('45 × 2.5 mm');
  });

  test('a finding stored before parts existed keeps its text', () => {
    expect(findingReason({ reason: 'Old words.' }, 'metric')).toBe('Old words.');
    expect(findingReason({ reason: 'Old words.', reasonParts: ['New ', { q: 25.4, d: 'length' }, '.'] }, 'imperial')).toBe('New 1.000 in.');
  });
});

// The demo rulebook, section C4.2.1 (rulesets/tarnwick-vale-mc-cage-regulations-2027.json): the open
// sprint class's "over 1,500 lb" band lists 1.500 × 0.120 in and 1.750 × 0.095 in mild steel.
const demo = compileFile('rulesets/tarnwick-vale-mc-cage-regulations-2027.json');
const sprint = (weightLb: number, wallIn: number) => ({
  vehicle: { classId: 'open-sprint', weightWithoutDriverKg: weightLb * LB },
  members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.625 * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom' }],
});

describe('a failing tube finding (2,800 lb, 1.625 × 0.083 in)', () => {
  test('lists every size the band allows, lightest first by mass per length, and says what to change', async () => {
    const f = finding(await check(demo, sprint(2800, 0.083)), 'tv-sprint-tubes', 'mh');
    expect(f.verdict).toBe('fail');
    // F-ENG-1 (computed): 1.750 × 0.095 in has 318.7 mm² of steel, 1.500 × 0.120 in 335.6 mm², so 1.750 × 0.095 is lighter.
    expect(f.reason).toContain('To pass, use one of the sizes this band lists, lightest first: mild steel 1.750 × 0.095 in; mild steel 1.500 × 0.120 in.');
    expect(f.reason).toMatch(/^No listed size fits for over 1,500 lb\. Nearest: mild steel 1\.750 × 0\.095 in \(OD 1\.625 in is under 1\.750 in; wall 0\.083 in is under 0\.095 in\)\./);
  });

  test('read by a metric steward, the same stored finding is written wholly in metric', async () => {
    const f = finding(await check(demo, sprint(2800, 0.083)), 'tv-sprint-tubes', 'mh');
    const metric = findingReason(f, 'metric');
    // 1,500 lb = 680.4 kg; 1.750 in = 44.45 mm; 0.083 in = 2.108 mm (F-UNIT-1, computed)
    expect(metric).toContain('for over 680 kg');
    expect(metric).toContain('OD 41.3 mm is under 44.5 mm');
    expect(metric).toContain('lightest first: mild steel 44.45 × 2.41 mm; mild steel 38.1 × 3.05 mm.');
    expect(metric).not.toMatch(/\d ?(in|lb)\b/);
    expect(findingReason(f, 'imperial')).not.toMatch(/\d ?(mm|kg)\b/);
  });
});

describe('every reason in a whole report', () => {
  const spec = {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 2400 * LB, chassis: 'unibody', cockpit: 'closed' },
    members: [
      { id: 'mh', kind: 'main_hoop', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', bends: [{ clrMm: 2 * IN }] },
      { id: 'db-l', kind: 'door_bar', odMm: 1.5 * IN, wallMm: 0.065 * IN, material: 'mild_steel', process: 'erw' },
    ],
    geometry: { rearBraceAngleFromVerticalDeg: 20, hoopAboveHelmetMm: 20 },
  };
  test('no reason mixes units, in either system, and every failing limit ends with what to change', async () => {
    const report = await check(demo, spec);
    const fails = report.findings.filter((f) => f.verdict === 'fail');
    expect(fails.length).toBeGreaterThan(2);
    for (const f of report.findings) {
      expect(findingReason(f, 'metric'), f.requirementId).not.toMatch(/\d ?(in|lb|psi)\b/);
      expect(findingReason(f, 'imperial'), f.requirementId).not.toMatch(/\d ?(mm|kg|MPa)\b/);
      expect(findingReason(f, 'metric')).not.toMatch(/\b1 classes\b/);
    }
    for (const f of fails) expect(f.reason, `${f.requirementId} ${f.member?.id ?? ''}`).toMatch(/To pass[:,] [^.]+(\.[^.]+)*\.$/);
  });

  test('a passing limit shows the numbers it passed on', async () => {
    const report = await check(demo, { ...spec, geometry: { rearBraceAngleFromVerticalDeg: 40, rearBraceAttachBelowTopMm: 100 } });
    const passed = report.findings.filter((f) => f.verdict === 'pass' && f.reasonParts?.some((p) => typeof p === 'object' && 'cmp' in p));
    expect(passed.length).toBeGreaterThan(0);
    for (const f of passed) expect(f.reason).toMatch(/^Meets it: .*\d.*\((at least|at most|less than|more than) /);
    // tv-brace-geometry, demo rulebook § C5.2.1 (invented): at least 30° from vertical
    expect(finding(report, 'tv-brace-geometry').reason).toContain('rear brace angle from vertical 40.0° (at least 30.0°)');
  });

  test('parts hold canonical values, so the stored run can be written in any units later', async () => {
    const f = finding(await check(demo, sprint(2800, 0.083)), 'tv-sprint-tubes', 'mh');
    expect(renderReason(f.reasonParts!, 'imperial')).toBe(f.reason);
    expect(JSON.parse(JSON.stringify(f.reasonParts))).toEqual(f.reasonParts);
  });
});
