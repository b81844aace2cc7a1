// parseSpecification: every invalid field with its path, including cross-field checks.
import { describe, expect, test } from 'vitest';
import { parseSpecification, SPEC_LIMITS } from '@backend/contracts/specification';

const good = () => ({
  vehicle: { classId: 'club-saloon', weightWithDriverKg: 1100 },
  members: [
    { id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 3.05, bends: [{ clrMm: 140, minOdMm: 42, maxOdMm: 45 }], wallReadings: [{ wallMm: 3.0, method: 'ultrasonic' }] },
    { id: 'rb1', kind: 'rear_brace', odMm: 44.45, wallMm: 3.05 },
    { id: 'rb2', kind: 'rear_brace', odMm: 44.45, wallMm: 3.05 },
  ],
  plates: [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', sidesMm: [100, 100], thicknessMm: 3 }],
  inspectionHoles: [{ memberId: 'mh', diameterMm: 4.8, distanceFromWeldOrBendMm: 90 }],
});

describe('parseSpecification', () => {
  test('a minimal specification (only kind, OD and wall per member) is valid', () => {
    expect(parseSpecification({ vehicle: { classId: 'x' }, members: [{ id: 'a', kind: 'main_hoop', odMm: 45, wallMm: 2.5 }] }).ok).toBe(true);
    expect(parseSpecification(good()).ok).toBe(true);
  });

  test.each<[string, (s: any) => void, string, RegExp]>([ // eslint-disable-line @typescript-eslint/no-explicit-any -- mutating test data
    ['wall ≥ OD/2', (s) => (s.members[2].wallMm = 30), 'members.2.wallMm', /half the outside diameter/],
    ['40 in OD (units mistake)', (s) => (s.members[1].odMm = 1016), 'members.1.odMm', /not a cage tube|at most/],
    ['negative wall', (s) => (s.members[0].wallMm = -1), 'members.0.wallMm', /greater than zero/],
    ['missing OD', (s) => delete s.members[0].odMm, 'members.0.odMm', /./],
    ['unknown kind', (s) => (s.members[0].kind = 'roll_hoop'), 'members.0.kind', /./],
    ['duplicate member id', (s) => (s.members[2].id = 'rb1'), 'members.2.id', /already used/],
    ['bend min OD above max OD', (s) => (s.members[0].bends[0].minOdMm = 46), 'members.0.bends.0.minOdMm', /cannot exceed/],
    ['wall reading ≥ OD/2', (s) => (s.members[0].wallReadings[0].wallMm = 19.9 + 3), 'members.0.wallReadings.0.wallMm', /half the outside diameter/],
    ['plate on an unknown member', (s) => (s.plates[0].memberId = 'zz'), 'plates.0.memberId', /No member/],
    ['hole on an unknown member', (s) => (s.inspectionHoles[0].memberId = 'zz'), 'inspectionHoles.0.memberId', /No member/],
    ['fractional bolt count', (s) => (s.plates[0].boltCount = 2.5), 'plates.0.boltCount', /whole number/],
    ['missing class', (s) => delete s.vehicle.classId, 'vehicle.classId', /./],
  ])('%s → %s', (_n, mutate, path, message) => {
    const s = good();
    mutate(s);
    const r = parseSpecification(s);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems).toContainEqual({ path, message: expect.stringMatching(message) });
  });

  test('problems in several members are all reported', () => {
    const s = good();
    s.members[0].wallMm = 30;
    s.members[2].odMm = -5;
    const r = parseSpecification(s);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems.map((p) => p.path)).toEqual(expect.arrayContaining(['members.0.wallMm', 'members.2.odMm']));
  });

  test(`at most ${SPEC_LIMITS.members} members`, () => {
    const s = good();
    s.members = Array.from({ length: SPEC_LIMITS.members + 1 }, (_, i) => ({ id: `m${i}`, kind: 'other', odMm: 40, wallMm: 2 }));
    const r = parseSpecification(s);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems[0].path).toBe('members');
  });
});
