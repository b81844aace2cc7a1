// The rule forms of issue 9 that read new sheet facts: per-side counts, dates, listed class weights,
// included angles, a maker's certificate in place of a rule, and foot/plate fixing as two facts.
// Each is opt-in: a document that does not write it keeps its verdicts (tested at the end).
import { describe, expect, test } from 'vitest';
import { compileRuleset, evaluateSpecification, validateRulesetDocument } from '@backend/domain/index';
import { parseSpecification } from '@backend/contracts/specification';
import { describeRulesetChanges } from '@backend/domain/rulebook/diff';
import type { RulesetDocument } from '@backend/contracts/ruleset';
import { check, compileFile, finding, loadJson } from './helpers';

type Json = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any -- test documents are edited freely

const doc = (requirements: unknown[], extra: Json = {}): Json => ({
  formatVersion: 1,
  rulebook: { publisher: 'Test club', title: 'Sides and dates', edition: '1', effectiveDate: '2027-01-01' },
  unitSystem: 'metric',
  classes: [{ id: 'c', name: 'Class', weightBasis: 'with_driver' }],
  requirements,
  ...extra,
});
const compiled = (d: Json) => {
  const v = validateRulesetDocument(d);
  if (!v.ok) throw new Error(JSON.stringify(v.problems));
  return compileRuleset(v.document);
};
const problems = (d: Json) => {
  const v = validateRulesetDocument(d);
  return v.ok ? [] : v.problems;
};
const doorBars = (side: Json) => ({
  id: 'doors', title: 'Door bars', section: 'T1', severity: 'mandatory', area: 'members', scope: { kind: 'vehicle' },
  requires: { template: 'required_members', members: [{ kinds: ['door_bar'], min: 1, ...side }] }, explanation: 'x',
});
const bar = (id: string, side?: string) => ({ id, kind: 'door_bar', odMm: 40, wallMm: 2, ...(side ? { side } : {}) });

describe('per-side counts ("at least one door bar on each side")', () => {
  const each = compiled(doc([doorBars({ side: 'each' })]));
  const total = compiled(doc([doorBars({})]));
  test('one bar on each side passes; two on the left and none on the right fail, though the total is 2', async () => {
    expect(finding(await check(each, { vehicle: { classId: 'c' }, members: [bar('l', 'left'), bar('r', 'right')] }), 'doors').verdict).toBe('pass');
    const f = finding(await check(each, { vehicle: { classId: 'c' }, members: [bar('l1', 'left'), bar('l2', 'left')] }), 'doors');
    expect(f.verdict).toBe('fail');
    expect(f.reason).toBe('Does not meet it: number of door bars on the right 0 (required at least 1). To pass: number of door bars on the right at least 1.');
  });
  test('a centre member counts on neither side', async () => {
    expect(finding(await check(each, { vehicle: { classId: 'c' }, members: [bar('l', 'left'), bar('c', 'centre')] }), 'doors').verdict).toBe('fail');
  });
  test('bars without sides → needs_information naming the side, never a pass', async () => {
    const f = finding(await check(each, { vehicle: { classId: 'c' }, members: [bar('a'), bar('b')] }), 'doors');
    expect(f.verdict).toBe('needs_information');
    expect(f.missing.map((m) => m.fact)).toEqual(['member.side']);
  });
  test('opt-in: without "side" the same sheet without sides passes on its total, as before', async () => {
    expect(finding(await check(total, { vehicle: { classId: 'c' }, members: [bar('a'), bar('b')] }), 'doors').verdict).toBe('pass');
  });
  test('with a cage model, a member without a typed side takes the side of its path (y > 0 is the left)', async () => {
    const node = (id: string, yMm: number, xMm: number) => ({ id, role: 'end', xMm, yMm, zMm: 400 });
    const spec = {
      vehicle: { classId: 'c' },
      model: { nodes: [node('la', 600, 0), node('lb', 600, 900), node('ra', -600, 0), node('rb', -600, 900)] },
      members: [
        { ...bar('l'), path: [{ nodeId: 'la' }, { nodeId: 'lb' }] },
        { ...bar('r'), path: [{ nodeId: 'ra' }, { nodeId: 'rb' }] },
      ],
    };
    expect(finding(await check(each, spec), 'doors').verdict).toBe('pass');
    spec.members[1].path = [{ nodeId: 'la' }, { nodeId: 'lb' }];
    expect(finding(await check(each, spec), 'doors').verdict).toBe('fail');
  });
  test('"on the driver\'s side" reads vehicle.driverSide', async () => {
    const drv = compiled(doc([doorBars({ side: 'driver', min: 2 })]));
    const members = [bar('r1', 'right'), bar('r2', 'right'), bar('l1', 'left')];
    expect(finding(await check(drv, { vehicle: { classId: 'c', driverSide: 'right' }, members }), 'doors').verdict).toBe('pass');
    const left = finding(await check(drv, { vehicle: { classId: 'c', driverSide: 'left' }, members }), 'doors');
    expect(left.verdict).toBe('fail');
    expect(left.reason).toMatch(/on the driver's side 1 \(required at least 2\)/);
    const unknown = finding(await check(drv, { vehicle: { classId: 'c' }, members }), 'doors');
    expect(unknown.verdict).toBe('needs_information');
    expect(unknown.missing.map((m) => m.fact)).toEqual(['vehicle.driverSide']);
  });
  test('a per-side count of a kind that spans the car is refused at its path', () => {
    const d = doc([{ ...doorBars({ side: 'each' }), requires: { template: 'required_members', members: [{ kinds: ['main_hoop'], min: 1, side: 'each' }] } }]);
    expect(problems(d)).toEqual([{ path: 'requirements.0.requires.members.0.side', message: expect.stringMatching(/main hoop spans the car/) }]);
  });
  test('params of vehicle.memberCountOnSide are checked', () => {
    const d = doc([{ ...doorBars({}), requires: { template: 'limit', checks: [{ fact: 'vehicle.memberCountOnSide', params: { kinds: ['door_bar'], side: 'top' }, operator: 'atLeast', value: 1 }] } }]);
    expect(problems(d).map((p) => p.path)).toEqual(['requirements.0.requires.checks.0.params.side']);
  });
});

describe('member.side on the sheet', () => {
  test('a side on a main hoop is refused at its path; on a door bar it is fine', () => {
    const r = parseSpecification({ vehicle: { classId: 'c' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 45, wallMm: 2.5, side: 'left' }, bar('d', 'right')] });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems).toEqual([{ path: 'members.0.side', message: 'A main hoop spans the car and has no side; leave the side empty.' }]);
  });
});

describe('dates (F-MSUK-3: "accepted only for cages approved before 1 Jan 1995")', () => {
  const legacy = {
    id: 'legacy', title: 'Legacy cage', section: 'T2', severity: 'mandatory', area: 'members', scope: { kind: 'vehicle' },
    requires: { template: 'limit', checks: [{ fact: 'cage.approvedOn', operator: 'below', value: '1995-01-01' }] }, explanation: 'x',
  };
  test('before the date passes, on it fails with the dates written out, without one needs information', async () => {
    const c = compiled(doc([legacy]));
    const at = async (cage: Json) => finding(await check(c, { vehicle: { classId: 'c' }, cage, members: [] }), 'legacy');
    expect((await at({ approvedOn: '1994-12-31' })).verdict).toBe('pass');
    const f = await at({ approvedOn: '1995-01-01' });
    expect(f.verdict).toBe('fail');
    expect(f.reason).toBe('Does not meet it: cage approval date 1 Jan 1995 (required before 1 Jan 1995). To pass: cage approval date before 1 Jan 1995.');
    expect((await at({})).verdict).toBe('needs_information');
  });
  test.each([
    ['not a date', '1 Jan 1995', 'requirements.0.requires.checks.0.value', /YYYY-MM-DD/],
    ['not a real day', '1995-02-30', 'requirements.0.requires.checks.0.value', /YYYY-MM-DD/],
  ])('a bad date value is refused: %s', (_n, value, path, message) => {
    const d = doc([{ ...legacy, requires: { template: 'limit', checks: [{ fact: 'cage.approvedOn', operator: 'below', value }] } }]);
    expect(problems(d)).toEqual([{ path, message: expect.stringMatching(message) }]);
  });
  test('a date compared with a number, or with a unit, is refused', () => {
    const d = doc([{ ...legacy, requires: { template: 'limit', checks: [{ fact: 'cage.approvedOn', operator: 'below', value: 1995 }] } }]);
    expect(problems(d).map((p) => p.path)).toEqual(['requirements.0.requires.checks.0.value']);
  });
  test('an approval date in the future is refused on the sheet, at its path', () => {
    const r = parseSpecification({ vehicle: { classId: 'c' }, members: [], cage: { approvedOn: '2999-01-01', builtOn: '2020-13-01' } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems.map((p) => p.path).sort()).toEqual(['cage.approvedOn', 'cage.builtOn']);
  });
  test('a legacy tube-table row with a bad date is refused at its path', () => {
    const msuk = loadJson('tests/fixtures/rulesets/msuk-ncr-2026.json') as Json;
    const d = structuredClone(msuk);
    d.requirements[3].requires.bands[0].rows[1].approvedBefore = '1995-13-01';
    expect(problems(d).map((p) => p.path)).toEqual(['requirements.3.requires.bands.0.rows.1.approvedBefore']);
  });
});

describe('listed class weight', () => {
  test('a listed weight over 10,000 kg is refused at its path (a units mistake)', () => {
    const d = doc([doorBars({})], { classes: [{ id: 'c', name: 'C', weightBasis: 'with_driver', listedWeight: { value: 25000, unit: 'kg' } }] });
    expect(problems(d).map((p) => p.path)).toEqual(['classes.0.listedWeight.value']);
  });
  test('a listed weight with a unit of another dimension is refused', () => {
    const d = doc([doorBars({})], { classes: [{ id: 'c', name: 'C', weightBasis: 'with_driver', listedWeight: { value: 1100, unit: 'mm' } }] });
    expect(problems(d)).toEqual([{ path: 'classes.0.listedWeight.unit', message: '"mm" is not a unit of mass.' }]);
  });
});

describe("a cage certified by its maker, where the rulebook accepts one", () => {
  const sizes = {
    id: 'sizes', title: 'Hoop sizes', section: 'T3', severity: 'mandatory', area: 'tubes', scope: { kind: 'member', memberKinds: ['main_hoop'] },
    requires: { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 45, wall: 2.5 }] }] }] }, explanation: 'x',
  };
  const thin = { id: 'mh', kind: 'main_hoop', odMm: 40, wallMm: 2 };
  test('the accepting rule is not checked and its reason names the certificate; other rules still are', async () => {
    const c = compiled(doc([{ ...sizes, acceptsMakerCertificate: true }, { ...sizes, id: 'sizes-strict' }]));
    const r = await check(c, { vehicle: { classId: 'c' }, cage: { certificate: { issuer: 'Example Cages Ltd', number: 'EC-2041' } }, members: [thin] });
    const f = finding(r, 'sizes', 'mh');
    expect(f.verdict).toBe('not_applicable');
    expect(f.reason).toMatch(/maker's certificate EC-2041 from Example Cages Ltd/);
    expect(f.acceptedOnCertificate).toEqual({ number: 'EC-2041', issuer: 'Example Cages Ltd' });
    expect(finding(r, 'sizes-strict', 'mh').verdict).toBe('fail');
    expect(r.verdict).toBe('fail');
  });
  test('without a certificate on the sheet the rule is checked as usual', async () => {
    const c = compiled(doc([{ ...sizes, acceptsMakerCertificate: true }]));
    expect(finding(await check(c, { vehicle: { classId: 'c' }, members: [thin] }), 'sizes', 'mh').verdict).toBe('fail');
  });
  test('cage.hasMakerCertificate is false (never unknown) without one', async () => {
    const c = compiled(doc([{ ...doorBars({}), requires: { template: 'limit', checks: [{ fact: 'cage.hasMakerCertificate', operator: 'equals', value: true }] } }]));
    expect(finding(await check(c, { vehicle: { classId: 'c' }, members: [] }), 'doors').verdict).toBe('fail');
  });
});

describe('foot and plate fixing, two facts (the demo hillclimb rulebook, Tarnwick Vale H4.1.1)', () => {
  const hill = compileFile('rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json');
  const foot = async (plate: Json) =>
    finding(await check(hill, { vehicle: { classId: 'hill-saloon' }, members: [], plates: [{ id: 'p', location: 'main_hoop_foot', thicknessMm: 3, sidesMm: [120, 100], ...plate }] }), 'hc-foot-bolts', 'p');
  test('a foot welded to its plate is not asked for bolts', async () => {
    expect((await foot({ plateFixing: 'bolted', footFixing: 'welded' })).verdict).toBe('pass');
  });
  test('a bolted foot needs 3 bolts', async () => {
    expect((await foot({ footFixing: 'bolted', boltCount: 3 })).verdict).toBe('pass');
    expect((await foot({ footFixing: 'bolted', boltCount: 2 })).verdict).toBe('fail');
  });
  test('how the foot is fixed unknown and 2 bolts → needs_information naming the foot fixing', async () => {
    const f = await foot({ boltCount: 2 });
    expect(f.verdict).toBe('needs_information');
    expect(f.missing.map((m) => m.fact)).toEqual(['plate.footFixing']);
  });
  test('an older sheet\'s single `fixing` still answers rulebooks that read plate.fixing; newer sheets answer it with plateFixing', async () => {
    const scca = compileFile('tests/fixtures/rulesets/scca-gcr-quoted.json');
    const welded = async (plate: Json) => finding(await check(scca, {
      vehicle: { classId: 'gcr_2008', weightWithDriverKg: 1200 }, members: [],
      plates: [{ id: 'p', location: 'main_hoop_foot', sidesMm: [12 * 25.4, 12 * 25.4], thicknessMm: 0.25 * 25.4, ...plate }],
    }), 'scca-welded-plates', 'p').verdict;
    expect(await welded({ fixing: 'welded' })).toBe('pass');
    expect(await welded({ plateFixing: 'welded', footFixing: 'welded' })).toBe('pass');
    expect(await welded({ plateFixing: 'bolted', footFixing: 'welded' })).toBe('not_applicable');
  });
});

describe('the compare view words the new forms', () => {
  const base = doc([doorBars({}), {
    id: 'sizes', title: 'Hoop sizes', section: 'T3', severity: 'mandatory', area: 'tubes', scope: { kind: 'member', memberKinds: ['main_hoop'] },
    requires: { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 45, wall: 2.5 }] }] }] }, explanation: 'x',
  }, {
    id: 'legacy', title: 'Legacy', section: 'T4', severity: 'mandatory', area: 'members', scope: { kind: 'vehicle' },
    requires: { template: 'limit', checks: [{ fact: 'cage.approvedOn', operator: 'below', value: '1995-01-01' }] }, explanation: 'x',
  }]);
  const texts = (edit: (d: Json) => void, before: Json = base) => {
    const after = structuredClone(before);
    edit(after);
    const v1 = validateRulesetDocument(before);
    const v2 = validateRulesetDocument(after);
    if (!v1.ok || !v2.ok) throw new Error('invalid');
    return describeRulesetChanges(v1.document as RulesetDocument, v2.document as RulesetDocument, {}).map((c) => c.text);
  };
  test.each<[string, (d: Json) => void, string]>([
    ['per side', (d) => (d.requirements[0].requires.members[0].side = 'each'), 'T1 door bar: at least 1 → at least 1 on each side'],
    ['legacy row', (d) => d.requirements[1].requires.bands[0].rows.push({ approvedBefore: '1995-01-01', alternatives: [{ od: 38, wall: 2.5 }] }), 'T3 all weights: sizes for any material, cages approved before 1 Jan 1995 added (38.0 × 2.50 mm)'],
    ['date limit', (d) => (d.requirements[2].requires.checks[0].value = '1996-01-01'), 'T4 cage approval date before 1 Jan 1995 → 1 Jan 1996'],
    ['listed weight', (d) => (d.classes[0].listedWeight = { value: 1100 }), "Class 'Class' tube sizes now follow the listed weight 1,100 kg (was the measured weight)"],
    ['certificate', (d) => (d.requirements[1].acceptsMakerCertificate = true), 'T3 now accepts a cage certified by its maker in its place'],
  ])('%s', (_n, edit, text) => {
    expect(texts(edit)).toContain(text);
  });
  test('a legacy row whose date moves reads as one change, not a row removed and a row added', () => {
    const legacy = structuredClone(base);
    legacy.requirements[1].requires.bands[0].rows.push({ approvedBefore: '1990-01-01', alternatives: [{ od: 38, wall: 2.5 }] });
    expect(texts((d) => (d.requirements[1].requires.bands[0].rows[1].approvedBefore = '1995-01-01'), legacy)).toEqual([
      'T3 all weights, any material: sizes now for cages approved before 1 Jan 1995 (was cages approved before 1 Jan 1990)',
    ]);
  });
});

describe('opt-in: documents that do not use the new forms keep their verdicts', () => {
  test('the first published demo regulations (a frozen copy) on a sheet without sides, dates or fixings ask for none of them', async () => {
    const demo = compileFile('tests/fixtures/rulesets/tarnwick-vale-cage-regulations-2027-first.json');
    const spec = { vehicle: { classId: 'club-saloon', weightWithDriverKg: 1100, cockpit: 'closed' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 3.05, process: 'dom', material: 'mild_steel' }] };
    const parsed = parseSpecification(spec);
    if (!parsed.ok) throw new Error('bad spec');
    const r = await evaluateSpecification(demo, 'club-saloon', parsed.value);
    expect(r.findings.some((f) => f.missing.some((m) => ['member.side', 'cage.approvedOn', 'plate.footFixing', 'vehicle.driverSide'].includes(m.fact)))).toBe(false);
  });
});

describe('the tube chooser honours legacy rows and listed weights', () => {
  test('F-MSUK-3: 38 × 2.5 and 40 × 2.0 are listed sizes only for a cage approved before 1 Jan 1995', async () => {
    const { listedSizesForBand } = await import('@backend/domain/tube-choice');
    const msuk = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json');
    const sizes = (approvedOn?: string) => {
      const r = listedSizesForBand(msuk, { classId: 'new_cage', memberKind: 'main_hoop', ...(approvedOn ? { approvedOn } : {}) });
      if (r.status !== 'listed') throw new Error(r.status);
      return r.sizes.map((s) => [s.odMm, s.wallMm]);
    };
    expect(sizes()).toEqual([[50, 2], [45, 2.5]]);
    expect(sizes('1995-01-01')).toEqual([[50, 2], [45, 2.5]]);
    expect(sizes('1990-05-01')).toEqual([[40, 2], [38, 2.5], [50, 2], [45, 2.5]]);
  });
  test('F-SCCA-T1: a class with a listed weight bands on it, whatever weight the query gives', async () => {
    const { listedSizesForBand } = await import('@backend/domain/tube-choice');
    const scca = compileFile('tests/fixtures/rulesets/scca-gcr-quoted.json');
    const r = listedSizesForBand(scca, { classId: 'gcr_2008_listed', memberKind: 'main_hoop', weightKg: 1000 * 0.45359237 });
    if (r.status !== 'listed') throw new Error(r.status);
    expect(r.sizes[0].bandLabel).toBe('1,701 – 2,699 lb');
  });
});
