// The compare view's words for the new rule forms (issue 9 §3): proportional limits, grades,
// member against member, measured walls and the thin-wall reading; a change of units alone is no change.
import { describe, expect, test } from 'vitest';
import type { Requires } from '@backend/contracts/ruleset';
import { describeRequiresChanges } from '@backend/domain/rulebook/diff-requires';

const imperial = { system: 'imperial', display: 'imperial' } as const;
type Side = { system: 'imperial' | 'metric'; display: 'imperial' | 'metric' };
const changes = (a: Requires, b: Requires, sa: Side = imperial, sb: Side = sa) => {
  const out: string[] = [];
  describeRequiresChanges(a, sa, b, sb, (kind, detail) => out.push(`${kind}: ${detail}`));
  return out;
};
const limit = (value: unknown, fact = 'plate.areaMm2'): Requires => ({ template: 'limit', checks: [{ fact, operator: 'atLeast', value: value as never }] });
const table = (extra: Partial<Extract<Requires, { template: 'tube_table' }>> = {}): Requires => ({
  template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 1.5, wall: 0.095 }] }] }], ...extra,
});

describe('compare view: new forms', () => {
  test('a proportional limit: k changed, and k rewritten in mm reads as unchanged', () => {
    expect(changes(limit({ times: 10, unit: 'in', of: 'plate.attachedOdMm' }), limit({ times: 12, unit: 'in', of: 'plate.attachedOdMm' }))).toEqual([
      'changed: plate area at least 10.000 in × OD of the attached member → 12.000 in × OD of the attached member',
    ]);
    expect(changes(limit({ times: 10, unit: 'in', of: 'plate.attachedOdMm' }), limit({ times: 254, unit: 'mm', of: 'plate.attachedOdMm' }))).toEqual([]);
    expect(changes(limit(15), limit({ times: 10, unit: 'in', of: 'plate.attachedOdMm' }))[0]).toMatch(/^changed: plate area at least 15(\.00)? in² → 10\.000 in × OD/);
  });
  test('a grade: the same grade written another way is no change; a stronger floor is', () => {
    expect(changes(limit('AS1163 C350', 'member.grade'), limit('as 1163 c350', 'member.grade'))).toEqual([]);
    expect(changes(limit('ISO 8.8', 'plate.boltGrade'), limit('10.9', 'plate.boltGrade'))).toEqual(['changed: bolt grade at least ISO 8.8 → ISO 10.9']);
  });
  test('member against member', () => {
    const a: Requires = { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }] };
    const b: Requires = { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'atLeast' }, { measure: 'wall', operator: 'equals' }] };
    expect(changes(a, b)).toEqual([
      "changed: OD equal to → at least the main hoop's",
      "added: wall must now be equal to the main hoop's",
    ]);
  });
  test('measured walls: added, changed, and the same tolerance in other units', () => {
    expect(changes(table(), table({ measuredWall: { method: 'ultrasonic' } }))).toEqual([
      'added: measured wall now required: thinnest ultrasonic gauge reading at least the table wall',
    ]);
    expect(changes(table({ measuredWall: { method: 'ultrasonic', tolerance: { value: 0.3, unit: 'mm' } } }), table({ measuredWall: { method: 'ultrasonic', tolerance: { percent: 10 } } }))).toEqual([
      'changed: measured wall: thinnest ultrasonic gauge reading at least the table wall less 0.012 in → thinnest ultrasonic gauge reading at least the table wall less 10 %',
    ]);
    expect(changes(table({ measuredWall: { method: 'ultrasonic', tolerance: { value: 0.01 } } }), table({ measuredWall: { method: 'ultrasonic', tolerance: { value: 0.254, unit: 'mm' } } }))).toEqual([]);
  });
  test('the thin-wall reading: leaving it out is the smallest-listed reading', () => {
    const thin = (minimumDiameter?: 'smallest_listed' | 'largest_listed') => table({ allowances: { thinWallWhenOdExceedsMinimum: { odMargin: 0.25, minWall: 0.08, ...(minimumDiameter ? { minimumDiameter } : {}) } } });
    expect(changes(thin(), thin('smallest_listed'))).toEqual([]);
    expect(changes(thin(), thin('largest_listed'))).toEqual(['changed: thin-wall allowance now counts from the largest listed OD (was the smallest listed OD)']);
  });
});
