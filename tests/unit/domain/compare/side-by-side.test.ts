// One sheet against several rulebooks (issue 13 §5): the strictest demand per area and the sizes that
// satisfy every rulebook at once, on fixture rulebooks built from published tables. Each check names
// the fact in /work/shared/reference/FACTS.md it rests on.
import { describe, expect, test } from 'vitest';
import { compareRulebooks, satisfyAllLine, alternativeAccepts, type ComparedRulebook } from '@backend/domain/compare/side-by-side';
import type { CompiledRuleset } from '@backend/domain/index';
import { parseSpecification, type Specification } from '@backend/contracts/specification';
import { check, compileFile, IN, LB } from '../helpers';

const MSUK = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json');
const MSUK_PRINTED = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json', {
  acceptPrintedEquivalents: true,
  // F-MSUK-2: the rule prints 1.75 × 0.095 in beside 45 × 2.5 mm and 2.0 × 0.083 in beside 50 × 2.0 mm.
  printedEquivalents: [
    { size: { od: 45, wall: 2.5 }, printedAs: { od: 1.75, wall: 0.095, unit: 'in' } },
    { size: { od: 50, wall: 2.0 }, printedAs: { od: 2.0, wall: 0.083, unit: 'in' } },
  ],
});
const SCCA = compileFile('tests/fixtures/rulesets/scca-gcr-quoted.json');
const FIA = compileFile('tests/fixtures/rulesets/fia-art253-quoted.json');
const NHRA = compileFile('tests/fixtures/rulesets/nhra-quoted.json');

/** A 3,086 lb car with driver (SCCA's "2,700 lb and up" band), mild steel cold-drawn seamless tubes, a unibody. */
function sheet(classId: string, extra: Partial<Specification> = {}): Specification {
  const parsed = parseSpecification({
    vehicle: { classId, chassis: 'unibody', weightWithDriverKg: 1400, weightWithoutDriverKg: 1320 },
    members: [
      { id: 'mh', kind: 'main_hoop', odMm: 45, wallMm: 2.5, material: 'mild_steel', process: 'cds' },
      { id: 'rb', kind: 'rear_brace', odMm: 40, wallMm: 2.0, material: 'mild_steel', process: 'cds' },
    ],
    plates: [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [120, 120], thicknessMm: 3 }],
    ...extra,
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
  return parsed.value;
}

async function column(key: string, compiled: CompiledRuleset, classId: string, spec: Specification, home = false): Promise<ComparedRulebook> {
  const forClass = { ...spec, vehicle: { ...spec.vehicle, classId } };
  return { key, home, classId, compiled, report: await check(compiled, forClass) };
}

async function matrix(spec: Specification, cols: [string, CompiledRuleset, string][]) {
  const built = await Promise.all(cols.map(([key, c, cls], i) => column(key, c, cls, spec, i === 0)));
  return compareRulebooks(spec, built);
}

const row = (m: Awaited<ReturnType<typeof matrix>>, key: string) => {
  const r = m.rows.find((x) => x.key === key);
  if (!r) throw new Error(`no row ${key} in ${m.rows.map((x) => x.key).join(', ')}`);
  return r;
};

describe('strictest main hoop', () => {
  test('MSUK and SCCA for a 3,086 lb car: the largest least OD is MSUK’s 45 mm, the thickest least wall SCCA’s 0.080 in', async () => {
    const spec = sheet('new_cage');
    const m = await matrix(spec, [['msuk', MSUK, 'new_cage'], ['scca', SCCA, 'gcr_2008']]);
    const t = row(m, 'member:main_hoop').tubes!;
    // F-MSUK-2 (NCR 2026 Ch. 7 App. 3 Art. 20.1 c i): 45 × 2.5 or 50 × 2.0 mm, so at least 45 mm OD and 2.0 mm wall.
    expect(t.demands[0]).toMatchObject({ leastOdMm: 45, leastWallMm: 2.0 });
    // F-SCCA-T1 (GCR §9.4, 2,700 lb and up): 1.750 × 0.095 or 1.625 × 0.120 in; the thin-wall allowance
    // (OD 0.250 in above the minimum) lets the wall fall to 0.080 in. Least OD 1.625 in, least wall 0.080 in.
    expect(t.demands[1]!.leastOdMm).toBeCloseTo(1.625 * IN, 6);
    expect(t.demands[1]!.leastWallMm).toBeCloseTo(0.08 * IN, 6);
    expect(t.strictestOdMm).toBe(45);
    expect(t.strictestOdColumns).toEqual([0]);
    expect(t.strictestWallMm).toBeCloseTo(0.08 * IN, 6);
    expect(t.strictestWallColumns).toEqual([1]);
  });

  test('a lighter car moves SCCA to its own band (1,701 – 2,699 lb): its demands change, MSUK’s do not', async () => {
    const spec = sheet('new_cage', { vehicle: { classId: 'new_cage', chassis: 'unibody', weightWithDriverKg: 2400 * LB, weightWithoutDriverKg: 2200 * LB } } as Partial<Specification>);
    const m = await matrix(spec, [['msuk', MSUK, 'new_cage'], ['scca', SCCA, 'gcr_2008']]);
    const t = row(m, 'member:main_hoop').tubes!;
    // F-SCCA-T1: 1,701 – 2,699 lb asks 1.500 × 0.095 or 1.625 × 0.080 in.
    expect(t.demands[1]!.leastOdMm).toBeCloseTo(1.5 * IN, 6);
    expect(t.demands[1]!.leastWallMm).toBeCloseTo(0.08 * IN, 6);
    expect(t.demands[0]).toMatchObject({ leastOdMm: 45, leastWallMm: 2.0 }); // F-MSUK-2
  });
});

describe('satisfies all: the intersection of listed sizes', () => {
  test('MSUK + SCCA: 45 × 2.5 mm is accepted by both; 50 × 2.0 mm is not (SCCA wants 0.095 in, or 0.080 in on a 1.875 in tube)', async () => {
    const m = await matrix(sheet('new_cage'), [['msuk', MSUK, 'new_cage'], ['scca', SCCA, 'gcr_2008']]);
    const t = row(m, 'member:main_hoop').tubes!;
    // F-MSUK-2 lists 45 × 2.5; F-SCCA-T1 accepts it through 1.750 × 0.095 in (44.45 × 2.41 mm).
    expect(t.satisfyAll).toEqual([{ odMm: 45, wallMm: 2.5 }]);
    // The brace has MSUK's table only (F-MSUK-4): its lighter listed size, 40 × 2.0 mm, satisfies "all".
    expect(satisfyAllLine(m, 'metric')).toMatch(/^To satisfy all 2 rulebooks at once: 45 × 2\.5 mm for the main hoop; 40 × 2 mm for the rear brace \(backstay\)\./);
  });

  test('MSUK + SCCA + NHRA (mild steel): nothing in the listed sizes satisfies all three, and the line says so', async () => {
    const m = await matrix(sheet('new_cage'), [['msuk', MSUK, 'new_cage'], ['scca', SCCA, 'gcr_2008'], ['nhra', NHRA, 'roll_cage']]);
    const t = row(m, 'member:main_hoop').tubes!;
    // F-NHRA-1: mild steel 1-5/8 × 0.118 in. 45 × 2.5 mm is too thin for it; its 41.3 mm OD is below F-MSUK-2's 45 mm.
    expect(t.demands[2]!.leastWallMm).toBeCloseTo(0.118 * IN, 6);
    expect(t.strictestWallColumns).toEqual([2]);
    expect(t.satisfyAll).toEqual([]);
    expect(satisfyAllLine(m, 'metric')).toMatch(/^Nothing in the listed sizes satisfies all 3 rulebooks at once for the main hoop/);
  });

  test('when MSUK accepts its printed equivalents (F-MSUK-2), SCCA’s 1.750 × 0.095 in becomes common ground with SCCA; NASA-like walls still not', async () => {
    const m = await matrix(sheet('new_cage'), [['msuk', MSUK_PRINTED, 'new_cage'], ['scca', SCCA, 'gcr_2008']]);
    const sizes = row(m, 'member:main_hoop').tubes!.satisfyAll;
    // 1.75 × 0.095 in is printed beside 45 × 2.5 (F-MSUK-2) and listed by F-SCCA-T1 for 2,700 lb and up.
    expect(sizes.some((s) => Math.abs(s.odMm - 1.75 * IN) < 1e-6 && Math.abs(s.wallMm - 0.095 * IN) < 1e-6)).toBe(true);
    expect(sizes.some((s) => s.odMm === 45 && s.wallMm === 2.5)).toBe(true);
    // Lightest first: 1.750 × 0.095 in has less section area than 45 × 2.5 mm.
    expect(sizes[0]!.odMm).toBeCloseTo(1.75 * IN, 6);
  });

  test('a banded table without the weight on its class’s basis is left out, and the line says so (F-SCCA-T1 bands by weight with driver)', async () => {
    const spec = sheet('new_cage', { vehicle: { classId: 'new_cage', chassis: 'unibody', weightWithoutDriverKg: 1320 } } as Partial<Specification>);
    const m = await matrix(spec, [['msuk', MSUK, 'new_cage'], ['scca', SCCA, 'gcr_2008']]);
    const t = row(m, 'member:main_hoop').tubes!;
    expect(t.undecidedColumns).toEqual([1]);
    expect(t.demands[1]).toBeNull();
    // F-MSUK-2 alone: its lighter listed size.
    expect(t.satisfyAll[0]).toEqual({ odMm: 50, wallMm: 2.0 });
    expect(satisfyAllLine(m, 'metric')).toMatch(/^To satisfy the one rulebook that gives a size for this car: 50 × 2 mm for the main hoop[\s\S]*General Competition Rules[\s\S]* cannot be read without the car's weight/);
  });

  test('MSUK and FIA list the same main hoop sizes (F-MSUK-2 and F-FIA-1): both sizes satisfy both', async () => {
    const m = await matrix(sheet('new_cage'), [['msuk', MSUK, 'new_cage'], ['fia', FIA, 'group_n']]);
    expect(row(m, 'member:main_hoop').tubes!.satisfyAll).toEqual([{ odMm: 50, wallMm: 2.0 }, { odMm: 45, wallMm: 2.5 }].sort((a, b) => a.odMm * a.wallMm - b.odMm * b.wallMm));
  });

  test('an allowance accepts by OD and wall, not by the listed size alone (F-SCCA-T1 thin-wall allowance)', () => {
    const allowance = { label: 'x', odMm: 1.875 * IN, wallMm: 0.08 * IN, requiredWallMm: 0.08 * IN, source: 'allowance' as const };
    expect(alternativeAccepts(allowance, { odMm: 48, wallMm: 2.1 })).toBe(true);
    expect(alternativeAccepts(allowance, { odMm: 50, wallMm: 2.0 })).toBe(false);
    expect(alternativeAccepts(allowance, { odMm: 47, wallMm: 2.5 })).toBe(false);
  });
});

describe('strictest plate at the main hoop foot', () => {
  test('thickness: NHRA’s 0.125 in over FIA’s 3 mm and SCCA’s 0.080 in; area: only FIA sets a least area (120 cm²), SCCA a most (144 in²)', async () => {
    const m = await matrix(sheet('new_cage'), [['fia', FIA, 'group_n'], ['scca', SCCA, 'gcr_2008'], ['nhra', NHRA, 'roll_cage']]);
    const r = row(m, 'plate:main_hoop_foot');
    const thickness = r.limits.find((l) => l.fact === 'plate.thicknessMm' && l.direction === 'atLeast')!;
    expect(thickness.values[0]).toBeCloseTo(3, 6); // F-FIA-M1
    expect(thickness.values[1]).toBeCloseTo(0.08 * IN, 6); // F-SCCA-M1
    expect(thickness.values[2]).toBeCloseTo(0.125 * IN, 6); // F-NHRA-M1
    expect(thickness.strictestColumns).toEqual([2]);
    const leastArea = r.limits.find((l) => l.fact === 'plate.areaMm2' && l.direction === 'atLeast')!;
    expect(leastArea.values).toEqual([12000, null, null]); // F-FIA-M1: 120 cm²
    expect(leastArea.strictestColumns).toEqual([0]);
    const mostArea = r.limits.find((l) => l.fact === 'plate.areaMm2' && l.direction === 'atMost')!;
    expect(mostArea.values[1]).toBeCloseTo(144 * IN * IN, 3); // F-SCCA-M1
  });
});

describe('the matrix', () => {
  test('home first, rows from the vocabularies in order, a verdict and the governing section per cell', async () => {
    const spec = sheet('new_cage');
    const built = [await column('scca', SCCA, 'gcr_2008', spec), await column('msuk', MSUK, 'new_cage', spec, true)];
    const m = compareRulebooks(spec, built);
    expect(m.columns.map((c) => [c.key, c.home])).toEqual([['msuk', true], ['scca', false]]);
    const keys = m.rows.map((r) => r.key);
    expect(keys.indexOf('member:main_hoop')).toBeLessThan(keys.indexOf('member:rear_brace'));
    expect(keys.indexOf('member:rear_brace')).toBeLessThan(keys.indexOf('plate:main_hoop_foot'));
    // F-MSUK-2's table covers lateral hoops too, but this sheet has none: no row asks about one.
    expect(keys).not.toContain('member:lateral_hoop');
    // The rear brace: MSUK lists 38 × 2.5 or 40 × 2.0 for it (F-MSUK-4) and the brace is 40 × 2.0; SCCA's
    // §9.4 table is for hoops only, so SCCA has no tube rule for the brace.
    const brace = row(m, 'member:rear_brace');
    expect(brace.tubes!.demands[0]).toMatchObject({ leastOdMm: 38, leastWallMm: 2.0 });
    expect(brace.tubes!.demands[1]).toBeNull();
    // Main hoop: 45 × 2.5 meets F-MSUK-2's tube table, and its section is the governing one when something decides.
    const hoop = row(m, 'member:main_hoop');
    expect(hoop.cells[0]!.sections).toContain('Ch. 7 App. 3 Art. 20.1 c i');
    expect(hoop.cells[1]!.sections).toContain('GCR 9.4 table');
  });

  test('a failing tube decides its cell, with its section first', async () => {
    const spec = sheet('new_cage', { members: [{ id: 'mh', kind: 'main_hoop', odMm: 38, wallMm: 2.0, material: 'mild_steel', process: 'cds' }] } as Partial<Specification>);
    const m = await matrix(spec, [['msuk', MSUK, 'new_cage'], ['scca', SCCA, 'gcr_2008']]);
    const hoop = row(m, 'member:main_hoop');
    // F-MSUK-2 / F-MSUK-3: 38 × 2.0 is below 45 × 2.5 / 50 × 2.0, and below the legacy 38 × 2.5 / 40 × 2.0 too.
    expect(hoop.cells[0]).toMatchObject({ verdict: 'fail', severity: 'mandatory' });
    expect(hoop.cells[0]!.sections[0]).toBe('Ch. 7 App. 3 Art. 20.1 c i');
    expect(hoop.cells[1]!.verdict).toBe('fail'); // F-SCCA-T1: nothing under 1.625 in for 2,700 lb and up
  });

  test('a rulebook without a rule for a row has an empty cell, not a verdict', async () => {
    const spec = sheet('new_cage');
    const m = await matrix(spec, [['fia', FIA, 'group_n'], ['nhra', NHRA, 'roll_cage']]);
    const welding = m.rows.find((r) => r.key === 'area:welding');
    expect(welding?.cells[0]).toEqual({ verdict: null, severity: null, sections: [], findings: 0 });
    expect(welding?.cells[1]!.verdict).not.toBeNull();
  });
});
