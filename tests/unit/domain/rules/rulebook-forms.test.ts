// Rules as rulebooks write them (issue 9 §3): proportional limits, member against member, ordered
// grades, measured walls in tube tables and the two readings of the thin-wall allowance. Each
// verdict is checked against /work/shared/reference/FACTS.md, naming the fact id and its source;
// values from memory or computed here say so.
import { describe, expect, test } from 'vitest';
import { compileRuleset, validateRulesetDocument } from '@backend/domain/index';
import type { CompiledRuleset } from '@backend/domain/index';
import { GRADES, findGrade, gradeAtLeast, normaliseGradeName } from '@backend/domain/grades';
import { IN, LB, check, finding, loadJson } from '../helpers';

type Doc = Record<string, unknown>;
const base = (unitSystem: 'imperial' | 'metric', requirements: unknown[], extra: Doc = {}): Doc => ({
  formatVersion: 1,
  rulebook: { publisher: 'Test', title: 'Forms', edition: '1', effectiveDate: '2027-01-01' },
  unitSystem,
  classes: [{ id: 'c', name: 'C', weightBasis: 'with_driver' }],
  requirements,
  ...extra,
});
const req = (id: string, scope: unknown, requires: unknown) => ({ id, title: id, section: '1', severity: 'mandatory', area: 'mounting', scope, requires, explanation: '' });
const plateScope = { kind: 'plate', locations: ['main_hoop_foot'] };

function compile(doc: Doc): CompiledRuleset {
  const v = validateRulesetDocument(doc);
  if (!v.ok) throw new Error(JSON.stringify(v.problems));
  return compileRuleset(v.document);
}
function problems(doc: Doc): { path: string; message: string }[] {
  const v = validateRulesetDocument(doc);
  return v.ok ? [] : v.problems;
}

describe('proportional limits (F-SCCA-M3, SCCA ProRally plates: area ≥ 10 × tube OD, every dimension ≥ 2 × OD)', () => {
  // As printed: "1.5 in tube → 15 in²" makes the 10 a length (10 in × 1.5 in = 15 in²).
  const doc = base('imperial', [
    req('plates', plateScope, {
      template: 'limit',
      checks: [
        { fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, of: 'plate.attachedOdMm' } },
        { fact: 'plate.areaMm2', operator: 'atLeast', value: { times: 10, unit: 'in', of: 'plate.attachedOdMm' } },
      ],
    }),
  ]);
  const compiled = compile(doc);
  const run = async (sidesIn: [number, number] | undefined, odIn = 1.5) =>
    finding(
      await check(compiled, {
        vehicle: { classId: 'c' },
        members: [{ id: 'mh', kind: 'main_hoop', odMm: odIn * IN, wallMm: 0.095 * IN }],
        plates: [{ id: 'p', location: 'main_hoop_foot', memberId: 'mh', ...(sidesIn ? { sidesMm: [sidesIn[0] * IN, sidesIn[1] * IN] } : {}) }],
      }),
      'plates',
      'p',
    );
  test.each([
    ['4 × 4 in (16 in², sides 4 in)', 'pass', [4, 4]],
    ['3 × 5 in: exactly 15 in² and exactly 2 × 1.5 in', 'pass', [3, 5]],
    ['3.5 × 4 in: 14 in² under 15 in²', 'fail', [3.5, 4]],
    ['2.9 × 6 in: 17.4 in² but a side under 3.0 in', 'fail', [2.9, 6]],
  ] as const)('1.5 in tube, plate %s → %s', async (_t, verdict, sides) => {
    expect((await run([sides[0], sides[1]])).verdict).toBe(verdict);
  });
  test('the limit follows the tube: the same 4 × 4 in plate fails under a 1.75 in tube (side 3.5 in ok, area 17.5 in² > 16)', async () => {
    expect((await run([4, 4], 1.75)).verdict).toBe('fail');
  });
  test('the reason shows the other value and the product in the reader’s units', async () => {
    const f = await run([3.5, 4]);
    expect(f.reason).toContain('10.000 in × OD of the attached member (1.500 in) = 15.00 in²');
  });
  test('no plate size → needs information, never pass', async () => {
    expect((await run(undefined)).verdict).toBe('needs_information');
  });
  test('a plate without its member → needs information naming the attached OD', async () => {
    const r = await check(compiled, { vehicle: { classId: 'c' }, members: [], plates: [{ id: 'p', location: 'main_hoop_foot', sidesMm: [200, 200] }] });
    const f = finding(r, 'plates', 'p');
    expect(f.verdict).toBe('needs_information');
    expect(f.missing.map((m) => m.fact)).toContain('plate.attachedOdMm');
  });
  const bad = (check: unknown) => problems(base('imperial', [req('p', plateScope, { template: 'limit', checks: [check] })]));
  test('an area as k × a length without a unit for k is refused at the unit', () => {
    expect(bad({ fact: 'plate.areaMm2', operator: 'atLeast', value: { times: 10, of: 'plate.attachedOdMm' } })).toEqual([
      { path: 'requirements.0.requires.checks.0.value.unit', message: expect.stringContaining('k a length') },
    ]);
  });
  test('a length as k × a length with a unit on k is refused at the unit', () => {
    expect(bad({ fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, unit: 'in', of: 'plate.attachedOdMm' } })[0]?.path).toBe('requirements.0.requires.checks.0.value.unit');
  });
  test('a length as k × an area (another dimension) is refused at `of`', () => {
    expect(bad({ fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, of: 'plate.areaMm2' } })).toEqual([
      { path: 'requirements.0.requires.checks.0.value.of', message: expect.stringContaining('a length cannot be k × a area') },
    ]);
  });
  test('an area unit for k is refused (k for area ≥ k × length must be a length)', () => {
    expect(bad({ fact: 'plate.areaMm2', operator: 'atLeast', value: { times: 10, unit: 'in2', of: 'plate.attachedOdMm' } })[0]?.path).toBe('requirements.0.requires.checks.0.value.unit');
  });
  test('"equals" is refused for a proportional limit, and an unknown other fact at its path', () => {
    expect(bad({ fact: 'plate.leastSideMm', operator: 'equals', value: { times: 2, of: 'plate.attachedOdMm' } })[0]?.path).toBe('requirements.0.requires.checks.0.operator');
    expect(bad({ fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, of: 'plate.tubeOd' } })[0]?.path).toBe('requirements.0.requires.checks.0.value.of');
  });
  test('a proportional limit respects the document’s measurement tolerance like a fixed one', async () => {
    const tolerant = compile({ ...doc, measurementTolerance: { length: 0.05, area: 0.5 } });
    // 2.96 in side vs 3.0 in: within 0.05 in. 2.96 × 5 = 14.8 in² vs 15: within 0.5 in².
    const r = await check(tolerant, {
      vehicle: { classId: 'c' },
      members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.5 * IN, wallMm: 0.095 * IN }],
      plates: [{ id: 'p', location: 'main_hoop_foot', memberId: 'mh', sidesMm: [2.96 * IN, 5 * IN] }],
    });
    expect(finding(r, 'plates', 'p').verdict).toBe('pass');
  });
});

describe('member against member (F-NHRA-G1, NHRA GR 4.10 quoted secondhand: rear braces same diameter and wall as the hoop)', () => {
  const doc = base('imperial', [
    req('braces', { kind: 'member', memberKinds: ['rear_brace'] }, {
      template: 'member_match', of: ['main_hoop'],
      checks: [{ measure: 'od', operator: 'equals' }, { measure: 'wall', operator: 'equals' }],
    }),
  ]);
  const compiled = compile(doc);
  const hoop = { id: 'mh', kind: 'main_hoop', odMm: 1.625 * IN, wallMm: 0.118 * IN };
  const brace = (od: number, wall: number) => ({ id: 'rb', kind: 'rear_brace', odMm: od * IN, wallMm: wall * IN });
  const run = async (members: unknown[]) => finding(await check(compiled, { vehicle: { classId: 'c' }, members }), 'braces', 'rb');
  test.each([
    ['the hoop’s 1.625 × 0.118 in', 'pass', 1.625, 0.118],
    ['a smaller 1.500 in OD', 'fail', 1.5, 0.118],
    ['a thinner 0.095 in wall', 'fail', 1.625, 0.095],
    ['a thicker 0.134 in wall (not the same)', 'fail', 1.625, 0.134],
  ] as const)('brace of %s → %s', async (_t, verdict, od, wall) => {
    expect((await run([hoop, brace(od, wall)])).verdict).toBe(verdict);
  });
  test('the reason names the hoop’s size', async () => {
    expect((await run([hoop, brace(1.5, 0.118)])).reason).toContain('the largest OD of the main hoop (1.625 in)');
  });
  test('no main hoop on the sheet → needs information naming it, never pass', async () => {
    const f = await run([brace(1.625, 0.118)]);
    expect(f.verdict).toBe('needs_information');
    expect(f.missing.map((m) => m.label)).toContain('largest OD of the main hoop');
  });
  test('"at least" compares with the largest of several members', async () => {
    const atLeast = compile(base('metric', [req('b', { kind: 'member', memberKinds: ['door_bar'] }, { template: 'member_match', of: ['main_hoop', 'front_hoop'], checks: [{ measure: 'wall', operator: 'atLeast' }] })]));
    const r = await check(atLeast, {
      vehicle: { classId: 'c' },
      members: [{ id: 'mh', kind: 'main_hoop', odMm: 45, wallMm: 2.5 }, { id: 'fh', kind: 'front_hoop', odMm: 45, wallMm: 3 }, { id: 'db', kind: 'door_bar', odMm: 40, wallMm: 2.5 }],
    });
    expect(finding(r, 'b', 'db').verdict).toBe('fail');
  });
  test('a member kind of its own scope is refused at `of`', () => {
    expect(problems(base('metric', [req('b', { kind: 'member', memberKinds: ['rear_brace'] }, { template: 'member_match', of: ['main_hoop', 'rear_brace'], checks: [{ measure: 'od', operator: 'equals' }] })]))).toEqual([
      { path: 'requirements.0.requires.of.1', message: expect.stringContaining('own scope') },
    ]);
  });
});

describe('ordered grades', () => {
  test('names are normalised: "AS1163 C350" = "as 1163 c350" (F-MAT-7)', () => {
    expect(normaliseGradeName('AS1163 C350')).toBe(normaliseGradeName('as 1163 c350'));
    expect(findGrade('material', 'AS1163 C350')?.id).toBe('as1163-c350');
    expect(findGrade('material', 'as 1163 c350')?.id).toBe('as1163-c350');
    expect(findGrade('bolt', 'Class 10.9')?.id).toBe('iso-10.9');
    expect(findGrade('material', 'unobtainium 9000')).toBeUndefined();
  });
  test('sourced values: F-MAT-7 (AS 1163 C250 250/320, C350 350/430 MPa) and F-MAT-1 (ASTM A513 1020 DOM 414/483 MPa)', () => {
    expect(findGrade('material', 'AS 1163 C250')).toMatchObject({ minYieldMpa: 250, minTensileMpa: 320, source: 'F-MAT-7' });
    expect(findGrade('material', 'AS 1163 C350')).toMatchObject({ minYieldMpa: 350, minTensileMpa: 430, source: 'F-MAT-7' });
    expect(findGrade('material', '1020 DOM')).toMatchObject({ minYieldMpa: 414, minTensileMpa: 483, source: 'F-MAT-1' });
    expect(findGrade('material', '4130 normalized')).toMatchObject({ minYieldMpa: 345, minTensileMpa: 483, source: 'F-MAT-1' });
  });
  test('every grade not in FACTS.md says it is from memory', () => {
    for (const g of [...GRADES.material, ...GRADES.bolt]) expect(g.source, g.name).toMatch(/^(F-MAT-\d|memory)/);
    expect(findGrade('material', 'AS 1163 C300')!.source).toMatch(/^memory/);
    for (const g of GRADES.bolt) expect(g.source).toMatch(/^memory/);
  });
  test('each family is in one order, weakest first; bolts: 8.8, SAE 5, SAE 8, 10.9, 12.9 (by tensile, memory values)', () => {
    expect(GRADES.bolt.map((g) => g.id)).toEqual(['iso-8.8', 'sae-5', 'sae-8', 'iso-10.9', 'iso-12.9']);
    for (const family of [GRADES.material, GRADES.bolt]) for (let i = 1; i < family.length; i++) expect(family[i]!.minTensileMpa).toBeGreaterThanOrEqual(family[i - 1]!.minTensileMpa);
  });
  test('"at least" needs both minimums: SAE Grade 5 (yield 634 MPa from memory) does not meet ISO 8.8 (640 MPa, memory) despite more tensile', () => {
    expect(gradeAtLeast(findGrade('bolt', 'SAE 5')!, findGrade('bolt', '8.8')!)).toBe(false);
    expect(gradeAtLeast(findGrade('bolt', '10.9')!, findGrade('bolt', '8.8')!)).toBe(true);
  });

  // F-SSA-1 (Speedway Sedans Australia): roll bar material minimum AS 1163 Grade 300.
  const ssa = compile(base('metric', [
    req('grade', { kind: 'member', memberKinds: ['main_hoop'] }, { template: 'limit', checks: [{ fact: 'member.grade', operator: 'atLeast', value: 'AS 1163 Grade 300' }] }),
    req('bolts', plateScope, { template: 'limit', checks: [{ fact: 'plate.boltGrade', operator: 'atLeast', value: 'ISO 8.8' }] }),
  ]));
  const hoopWith = async (grade: string | undefined) =>
    finding(await check(ssa, { vehicle: { classId: 'c' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 38, wallMm: 3, ...(grade ? { grade } : {}) }] }), 'grade', 'mh');
  test.each([
    ['AS1163 C350', 'pass'],
    ['as 1163 c350', 'pass'],
    ['AS 1163 C300', 'pass'],
    ['AS 1163 C250', 'fail'],
    ['ASTM A513 1020 as-welded', 'fail'],
  ])('F-SSA-1 "at least AS 1163 Grade 300": a hoop of %s → %s (a grade alone answers it)', async (grade, verdict) => {
    expect((await hoopWith(grade)).verdict).toBe(verdict);
  });
  test('a grade on the sheet outside the vocabulary, or none → needs information', async () => {
    expect((await hoopWith('1018 hot rolled')).verdict).toBe('needs_information');
    expect((await hoopWith(undefined)).verdict).toBe('needs_information');
  });
  test('bolts "ISO 8.8 or better" (F-MSUK-W2 names the floor; strengths from memory): 10.9 passes, SAE Grade 5 fails', async () => {
    const plate = async (boltGrade: string) => finding(await check(ssa, { vehicle: { classId: 'c' }, members: [], plates: [{ id: 'p', location: 'main_hoop_foot', boltGrade }] }), 'bolts', 'p');
    expect((await plate('10.9')).verdict).toBe('pass');
    expect((await plate('SAE Grade 5')).verdict).toBe('fail');
  });
  test('a grade not in the vocabulary is refused at the value, listing the known ones', () => {
    const p = problems(base('metric', [req('g', { kind: 'member', memberKinds: ['main_hoop'] }, { template: 'limit', checks: [{ fact: 'member.grade', operator: 'atLeast', value: 'Grade 9000' }] })]));
    expect(p).toEqual([{ path: 'requirements.0.requires.checks.0.value', message: expect.stringContaining('AS 1163 C300') }]);
  });
  test('a bolt grade is not a material grade', () => {
    const p = problems(base('metric', [req('g', { kind: 'member', memberKinds: ['main_hoop'] }, { template: 'limit', checks: [{ fact: 'member.grade', operator: 'atLeast', value: '8.8' }] })]));
    expect(p[0]?.path).toBe('requirements.0.requires.checks.0.value');
  });
});

describe('measured walls in tube tables', () => {
  // F-SSA-1: minimum 38 mm OD × 3.0 mm CHS; sonic test must read not less than 2.70 mm absolute.
  const ssaTable = (measuredWall: unknown, extra: Doc = {}) =>
    base('metric', [req('tubes', { kind: 'member', memberKinds: ['main_hoop'] }, { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 38, wall: 3 }] }] }], ...(measuredWall ? { measuredWall } : {}) })], extra);
  const sonic = compile(ssaTable({ method: 'ultrasonic', tolerance: { value: 0.3 } }));
  const hoop = async (compiled: CompiledRuleset, readings: { wallMm: number; method: string }[] | undefined, wallMm = 3) =>
    finding(await check(compiled, { vehicle: { classId: 'c' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 38, wallMm, ...(readings ? { wallReadings: readings } : {}) }] }), 'tubes', 'mh');
  test.each([
    [2.7, 'pass'],
    [2.85, 'pass'],
    [2.69, 'fail'],
  ])('F-SSA-1: 38 × 3.0 mm with a thinnest sonic reading of %d mm → %s', async (reading, verdict) => {
    expect((await hoop(sonic, [{ wallMm: 2.95, method: 'ultrasonic' }, { wallMm: reading, method: 'ultrasonic' }])).verdict).toBe(verdict);
  });
  test('the failing reason names the reading and the wall it needed', async () => {
    const f = await hoop(sonic, [{ wallMm: 2.5, method: 'ultrasonic' }]);
    expect(f.reason).toContain('thinnest ultrasonic wall reading 2.50 mm is under 2.70 mm');
    expect(f.measured.map((m) => m.fact)).toContain('member.minUltrasonicWallMm');
  });
  test('only readings by the rule’s method count: an inspection-hole reading alone → needs information', async () => {
    const f = await hoop(sonic, [{ wallMm: 2.9, method: 'inspection_hole' }]);
    expect(f.verdict).toBe('needs_information');
    expect(f.missing.map((m) => m.fact)).toEqual(['member.minUltrasonicWallMm']);
  });
  test('no reading → needs information, never pass', async () => {
    expect((await hoop(sonic, undefined)).verdict).toBe('needs_information');
  });
  test('a rulebook that sets no tolerance gets 0: a 2.99 mm reading fails a 3.0 mm wall', async () => {
    const strict = compile(ssaTable({ method: 'ultrasonic' }));
    expect((await hoop(strict, [{ wallMm: 2.99, method: 'ultrasonic' }])).verdict).toBe('fail');
    expect((await hoop(strict, [{ wallMm: 3, method: 'ultrasonic' }])).verdict).toBe('pass');
  });
  test('a percent tolerance is a percent of the table wall: 10 % of 3.0 mm leaves 2.70 mm (computed)', async () => {
    const pct = compile(ssaTable({ method: 'ultrasonic', tolerance: { percent: 10 } }));
    expect((await hoop(pct, [{ wallMm: 2.7, method: 'ultrasonic' }])).verdict).toBe('pass');
    expect((await hoop(pct, [{ wallMm: 2.68, method: 'ultrasonic' }])).verdict).toBe('fail');
  });
  test('the document’s measurement tolerance does not widen the reading limit (2.70 mm absolute stays 2.70)', async () => {
    const tolerant = compile(ssaTable({ method: 'ultrasonic', tolerance: { value: 0.3 } }, { measurementTolerance: { length: 0.05 } }));
    expect((await hoop(tolerant, [{ wallMm: 2.68, method: 'ultrasonic' }])).verdict).toBe('fail');
    // … while the nominal wall still gets it: 2.96 mm nominal meets 3.0 mm within 0.05 mm.
    expect((await hoop(tolerant, [{ wallMm: 2.8, method: 'ultrasonic' }], 2.96)).verdict).toBe('pass');
  });
  test('callipers are a method of their own', async () => {
    const calliper = compile(ssaTable({ method: 'callipers', tolerance: { value: 0.3 } }));
    expect((await hoop(calliper, [{ wallMm: 2.8, method: 'callipers' }])).verdict).toBe('pass');
    expect((await hoop(calliper, [{ wallMm: 2.8, method: 'ultrasonic' }])).verdict).toBe('needs_information');
  });
  test('a tolerance of 50 % is refused at its path', () => {
    expect(problems(ssaTable({ method: 'ultrasonic', tolerance: { percent: 50 } }))).toEqual([
      { path: 'requirements.0.requires.measuredWall.tolerance.percent', message: expect.stringContaining('under 50 %') },
    ]);
    expect(problems(ssaTable({ method: 'ultrasonic', tolerance: { percent: 49 } }))).toEqual([]);
  });
  test('an absolute tolerance of half a wall or more is refused, as is a method outside the list', () => {
    expect(problems(ssaTable({ method: 'ultrasonic', tolerance: { value: 1.5 } }))[0]?.path).toBe('requirements.0.requires.measuredWall.tolerance.value');
    expect(problems(ssaTable({ method: 'x-ray' }))[0]?.path).toBe('requirements.0.requires.measuredWall.method');
    expect(problems(ssaTable({ method: 'ultrasonic', tolerance: { value: 0.3, unit: 'deg' } }))[0]?.path).toBe('requirements.0.requires.measuredWall.tolerance.unit');
  });

  // Issue 9's false pass: "nominal 1.500 × 0.095 with a 0.070 in sonic reading passes the tube table".
  const sccaDoc = loadJson('tests/fixtures/rulesets/scca-gcr-quoted.json');
  const withSonic = (doc: Doc): Doc => {
    const copy = JSON.parse(JSON.stringify(doc)) as { requirements: { id: string; requires: Doc }[] };
    copy.requirements.find((r) => r.id === 'scca-t1-tubes')!.requires.measuredWall = { method: 'ultrasonic' };
    return copy as unknown as Doc;
  };
  const sccaHoop = async (compiled: CompiledRuleset) =>
    finding(
      await check(compiled, {
        vehicle: { classId: 'gcr_2008', weightWithDriverKg: 2400 * LB },
        members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.5 * IN, wallMm: 0.095 * IN, process: 'dom', wallReadings: [{ wallMm: 0.07 * IN, method: 'ultrasonic' }] }],
      }),
      'scca-t1-tubes',
      'mh',
    );
  test('F-SCCA-T1 table: 1.500 × 0.095 with a 0.070 in sonic reading fails once the document opts in', async () => {
    expect((await sccaHoop(compile(withSonic(sccaDoc)))).verdict).toBe('fail');
  });
  test('… and the published document without the option keeps its verdict (pass on the nominal wall)', async () => {
    expect((await sccaHoop(compile(sccaDoc))).verdict).toBe('pass');
  });
});

describe('words for a compared-with value (report screens and PDF)', () => {
  test('k × another fact and another member’s size, in the reader’s units, never a raw fact name', async () => {
    const { referenceWords } = await import('@backend/domain/rules/reference-words');
    const { requiredText } = await import('@backend/pdf/report-document');
    expect(referenceWords({ fact: 'plate.attachedOdMm', times: 2, timesDimension: null }, 'imperial')).toBe('2 × OD of the attached member');
    expect(referenceWords({ fact: 'plate.attachedOdMm', times: 254, timesDimension: 'length' }, 'imperial')).toBe('10.000 in × OD of the attached member');
    expect(referenceWords({ fact: 'peer.od.max.main_hoop' }, 'metric')).toBe('the largest OD of the main hoop');
    const text = requiredText({ fact: 'plate.areaMm2', label: 'plate area', operator: 'atLeast', value: { fact: 'plate.attachedOdMm', times: 254, timesDimension: 'length' }, dimension: 'area' }, 'metric');
    expect(text).toBe('plate area: at least 254 mm × OD of the attached member');
  });
});
