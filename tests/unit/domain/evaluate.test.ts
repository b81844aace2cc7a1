// evaluateSpecification: report shape, overall verdict, ordering, tube data, and the guarantee
// that a finding never passes when a value it needs is missing (property-based).
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { checkReportSchema } from '@backend/contracts/report';
import { UnknownClassError, evaluateSpecification } from '@backend/domain/index';
import { FACTS_BY_NAME } from '@backend/domain/facts';
import { IN, LB, check, compileFile, finding, loadJson } from './helpers';

const demo = compileFile('rulesets/tarnwick-vale-mc-cage-regulations-2027.json');
const metric = compileFile('rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json');

const fullSaloon = () => ({
  vehicle: { classId: 'club-saloon', weightWithDriverKg: 2400 * LB, cockpit: 'closed', chassis: 'unibody' },
  members: [
    { id: 'mh', kind: 'main_hoop', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', continuousPiece: true, bends: [{ clrMm: 6 * IN, minOdMm: 1.7 * IN, maxOdMm: 1.78 * IN }], lengthMm: 4200 },
    { id: 'fh', kind: 'front_hoop', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', bends: [{ clrMm: 6 * IN, minOdMm: 1.7 * IN, maxOdMm: 1.78 * IN }], lengthMm: 4000 },
    { id: 'rb1', kind: 'rear_brace', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', lengthMm: 1100 },
    { id: 'rb2', kind: 'rear_brace', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', lengthMm: 1100 },
    { id: 'db1', kind: 'door_bar', odMm: 1.5 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', bends: [], lengthMm: 1200 },
    { id: 'db2', kind: 'door_bar', odMm: 1.5 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', bends: [], lengthMm: 1200 },
    { id: 'dg', kind: 'diagonal', odMm: 1.5 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', lengthMm: 1300 },
    { id: 'hb', kind: 'harness_bar', odMm: 1.5 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', lengthMm: 1000 },
  ],
  geometry: { rearBraceAttachBelowTopMm: 3 * IN, rearBraceAngleFromVerticalDeg: 40, helmetBelowHoopLineMm: 2 * IN, harnessBarBelowShouldersMm: 1 * IN, nearestTubeToHelmetMm: 10 * IN },
  plates: [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [6 * IN, 6 * IN], thicknessMm: 0.125 * IN }],
  inspectionHoles: [{ memberId: 'mh', diameterMm: (3 / 16) * IN, distanceFromWeldOrBendMm: 4 * IN }],
});

describe('the demo ruleset on a complete Club Saloon', () => {
  test('passes, with a schema-valid, JSON-serialisable report', async () => {
    const r = await check(demo, fullSaloon());
    const failing = r.findings.filter((f) => f.verdict !== 'pass' && f.verdict !== 'not_applicable');
    expect(failing).toEqual([]);
    expect(r.verdict).toBe('pass');
    expect(checkReportSchema.parse(JSON.parse(JSON.stringify(r)))).toEqual(r);
    expect(r.disclaimer).toMatch(/pre-check/);
    expect(r.disclaimer).toMatch(/inspector decides/);
    expect(r.disclaimer).toMatch(/qualified people/);
  });

  test('deterministic: two runs give identical reports; findings in document order then member order', async () => {
    const a = await check(demo, fullSaloon());
    const b = await check(demo, fullSaloon());
    expect(JSON.stringify(a)).toBe(JSON.stringify(b));
    const order = demo.requirements.map((q) => q.id);
    const idx = a.findings.map((f) => order.indexOf(f.requirementId));
    expect([...idx].sort((x, y) => x - y)).toEqual(idx);
    expect(a.findings.filter((f) => f.requirementId === 'tv-saloon-tubes').map((f) => f.member?.id)).toEqual(['mh', 'fh', 'rb1', 'rb2']);
  });

  test('members run only through their kind’s requirements', async () => {
    const r = await check(demo, fullSaloon());
    for (const f of r.findings.filter((x) => x.member)) {
      const req = demo.requirements.find((q) => q.id === f.requirementId)!;
      expect(req.scope.kind === 'member' && req.scope.memberKinds.includes(f.member!.kind)).toBe(true);
    }
  });

  test('citations carry publisher, rulebook title, edition and section', async () => {
    const f = finding(await check(demo, fullSaloon()), 'tv-saloon-tubes', 'mh');
    expect(f.citation).toEqual({ publisher: 'Tarnwick Vale Motor Club', rulebookTitle: 'Tarnwick Vale MC Cage Regulations', edition: '2027', section: 'C4.2.2' });
    expect(f.measured).toContainEqual({ fact: 'member.odMm', label: 'outside diameter', value: 1.75 * IN, dimension: 'length' });
  });

  test('tube data and estimated cage tube mass (F-ENG-4: 1.750 × 0.095 in = 1.679 lb/ft)', async () => {
    const r = await check(demo, fullSaloon());
    const mh = r.tubes.members[0];
    expect(mh.massPerMetreKg / 1.48816).toBeCloseTo(1.679, 2);
    expect(mh.massKg).toBeCloseTo((mh.massPerMetreKg * 4200) / 1000, 9);
    expect(r.tubes.massComplete).toBe(true);
    expect(r.tubes.estimatedTubeMassKg).toBeCloseTo(r.tubes.members.reduce((s, m) => s + (m.massKg ?? 0), 0), 9);
  });

  test('a missing door bar is a finding, and the overall verdict fails', async () => {
    const s = fullSaloon();
    s.members = s.members.filter((m) => m.id !== 'db2');
    const r = await check(demo, s);
    const f = finding(r, 'tv-cage-members');
    expect(f.verdict).toBe('fail');
    expect(f.reason).toMatch(/door bars \(one each side at least\) 1 \(required at least 2\)/);
    expect(r.verdict).toBe('fail');
  });

  test('missing measurements → needs_information with what to measure next', async () => {
    const s = fullSaloon();
    delete (s.geometry as Record<string, unknown>).rearBraceAngleFromVerticalDeg;
    delete (s.members[0] as Record<string, unknown>).continuousPiece;
    const r = await check(demo, s);
    expect(r.verdict).toBe('needs_information');
    expect(r.measureNext.map((m) => m.fact)).toEqual(['geometry.rearBraceAngleFromVerticalDeg', 'member.continuousPiece']);
    expect(r.measureNext[1]).toMatchObject({ label: 'one continuous piece', memberIds: ['mh'] });
  });

  test('class filters apply: Open Sprint forbids 4130, Heavy Special accepts it', async () => {
    // The Heavy Special table asks for a sonic reading (demo rulebook C4.2.3).
    const mh = { id: 'mh', kind: 'main_hoop', odMm: 1.625 * IN, wallMm: 0.083 * IN, material: 'chromoly_4130', process: 'dom', continuousPiece: true, wallReadings: [{ wallMm: 0.083 * IN, method: 'ultrasonic' }] };
    const heavy = await check(demo, { vehicle: { classId: 'heavy-special', weightWithDriverKg: 3000 * LB }, welding: { process: 'tig' }, members: [mh] });
    expect(finding(heavy, 'tv-heavy-tubes', 'mh').verdict).toBe('pass');
    expect(finding(heavy, 'tv-4130-tig').verdict).toBe('pass');
    expect(heavy.findings.some((f) => f.requirementId === 'tv-no-chromoly')).toBe(false);
    const sprint = await check(demo, { vehicle: { classId: 'open-sprint', weightWithoutDriverKg: 1200 * LB }, members: [mh] });
    expect(finding(sprint, 'tv-no-chromoly', 'mh').verdict).toBe('fail');
  });

  test('wall allowance: 1.750 × 0.078 in 4130 passes against 0.083 − 0.005 (Heavy Special); 0.075 fails even with the 0.002 in tolerance', async () => {
    const hoop = (wallIn: number, sonicIn: number) => ({ id: 'mh', kind: 'main_hoop', odMm: 1.75 * IN, wallMm: wallIn * IN, material: 'chromoly_4130', wallReadings: [{ wallMm: sonicIn * IN, method: 'ultrasonic' }] });
    const r = await check(demo, { vehicle: { classId: 'heavy-special', weightWithDriverKg: 3000 * LB }, members: [hoop(0.078, 0.078)] });
    expect(finding(r, 'tv-heavy-tubes', 'mh').verdict).toBe('pass');
    const r2 = await check(demo, { vehicle: { classId: 'heavy-special', weightWithDriverKg: 3000 * LB }, members: [hoop(0.075, 0.075)] });
    expect(finding(r2, 'tv-heavy-tubes', 'mh').verdict).toBe('fail');
  });

  test('sonic walls (demo C4.2.3): the thinnest ultrasonic reading must be 90 % of the listed wall, without the mill allowance', async () => {
    const run = async (sonicIn: number | undefined) =>
      finding(await check(demo, { vehicle: { classId: 'heavy-special', weightWithDriverKg: 3000 * LB }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.625 * IN, wallMm: 0.083 * IN, material: 'chromoly_4130', ...(sonicIn === undefined ? {} : { wallReadings: [{ wallMm: sonicIn * IN, method: 'ultrasonic' }] }) }] }), 'tv-heavy-tubes', 'mh');
    // 90 % of 0.083 in = 0.0747 in (computed).
    expect((await run(0.075)).verdict).toBe('pass');
    expect((await run(0.074)).verdict).toBe('fail');
    expect((await run(undefined)).verdict).toBe('needs_information');
  });

  test('bolted plate compared with the attached tube wall (fact-to-fact comparison)', async () => {
    const s = fullSaloon();
    s.plates = [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'bolted', sidesMm: [6 * IN, 6 * IN], thicknessMm: 0.09 * IN, backingPlate: true, boltCount: 4, boltDiameterMm: 0.375 * IN } as never];
    expect(finding(await check(demo, s), 'tv-plates-bolted', 'p1').verdict).toBe('fail');
  });

  test('proportional welded plates (demo C6.1.1, after F-SCCA-M3): a 4 × 4 in plate under a 1.750 in hoop fails on area (16 < 17.5 in²)', async () => {
    const s = fullSaloon();
    s.plates = [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [4 * IN, 4 * IN], thicknessMm: 0.125 * IN } as never];
    const f = finding(await check(demo, s), 'tv-plates-welded', 'p1');
    expect(f.verdict).toBe('fail');
    expect(f.reason).toContain('10.000 in × OD of the attached member (1.750 in) = 17.50 in²');
  });

  test('unknown class is an error naming the classes', async () => {
    const s = fullSaloon();
    await expect(evaluateSpecification(demo, 'nope', s as never)).rejects.toThrow(UnknownClassError);
  });

  test('metric document: 1.75 × 0.095 in hoop passes via its printed equivalence; the policy is in the report', async () => {
    const r = await check(metric, { vehicle: { classId: 'hill-saloon' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', wallReadings: [{ wallMm: 2.3, method: 'ultrasonic' }] }] });
    expect(finding(r, 'hc-main-tubes', 'mh').verdict).toBe('pass');
    expect(r.policy).toEqual({ acceptPrintedEquivalents: true, strengthEquivalents: { accept: false, measure: 'section_modulus' }, measurementTolerance: { length: 0.05 } });
  });

  test('measurement tolerance: a 37.96 mm door bar counts as 38 with a 0.05 mm tolerance, 37.9 does not', async () => {
    const bar = async (od: number) => finding(await check(metric, { vehicle: { classId: 'hill-saloon' }, members: [{ id: 'db', kind: 'door_bar', odMm: od, wallMm: 2.5 }] }), 'hc-other-tubes', 'db').verdict;
    expect(await bar(37.96)).toBe('pass');
    expect(await bar(37.9)).toBe('fail');
  });
});

describe('a finding never passes when a required value is missing (property)', () => {
  // Removing any optional measurement may turn pass into needs_information, but every finding
  // that still passes must not depend on a fact that is now missing.
  const optionalGeometry = ['rearBraceAttachBelowTopMm', 'rearBraceAngleFromVerticalDeg', 'helmetBelowHoopLineMm', 'harnessBarBelowShouldersMm', 'nearestTubeToHelmetMm'];
  const optionalMember = ['material', 'process', 'continuousPiece', 'bends', 'lengthMm'];
  test('drop a random set of measurements', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.subarray(optionalGeometry),
        fc.array(fc.tuple(fc.integer({ min: 0, max: 7 }), fc.constantFrom(...optionalMember)), { maxLength: 12 }),
        fc.boolean(),
        async (dropGeometry, dropMember, dropWeight) => {
          const s = fullSaloon();
          for (const g of dropGeometry) delete (s.geometry as Record<string, unknown>)[g];
          for (const [i, k] of dropMember) delete (s.members[i] as Record<string, unknown>)[k];
          if (dropWeight) delete (s.vehicle as Record<string, unknown>).weightWithDriverKg;
          const r = await check(demo, s);
          for (const f of r.findings) {
            if (f.verdict === 'needs_information') expect(f.missing.length).toBeGreaterThan(0);
            if (f.verdict !== 'pass') continue;
            for (const req of f.required) {
              // a passing finding's required facts all had values
              if (req.fact === 'member.odMarginOverTableMinimumMm' || req.fact.startsWith('vehicle.memberCount')) continue;
              expect(f.measured.some((m) => m.fact === req.fact) || f.requirementId === 'tv-saloon-tubes').toBe(true);
            }
          }
          if (dropWeight) expect(r.findings.filter((f) => f.requirementId === 'tv-saloon-tubes').every((f) => f.verdict === 'needs_information')).toBe(true);
          // every geometry fact but the helmet distance feeds a mandatory requirement of this class
          const mandatoryDropped = dropGeometry.filter((g) => g !== 'nearestTubeToHelmetMm').length + (dropWeight ? 1 : 0);
          if (mandatoryDropped > 0) expect(r.verdict).not.toBe('pass');
        },
      ),
      { numRuns: 60 },
    );
  });

  test('`not` over a missing fact is unknown, never pass (Kleene logic)', async () => {
    const doc = compileFile('tests/fixtures/rulesets/fia-art253-quoted.json', {
      requirements: [{
        id: 'not-test', title: 'not over a missing fact', section: 'T1', severity: 'mandatory', area: 'padding', scope: { kind: 'vehicle' },
        requires: { template: 'conditions', conditions: { not: { fact: 'padding.standard', operator: 'equal', value: 'none' } } }, explanation: 'test',
      }],
    });
    const missing = await check(doc, { vehicle: { classId: 'group_n' }, members: [] });
    expect(finding(missing, 'not-test').verdict).toBe('needs_information');
    expect(finding(missing, 'not-test').missing).toEqual([{ fact: 'padding.standard', label: FACTS_BY_NAME.get('padding.standard')!.label, dimension: null }]);
    const given = await check(doc, { vehicle: { classId: 'group_n' }, padding: { standard: 'sfi_45_1' }, members: [] });
    expect(finding(given, 'not-test').verdict).toBe('pass');
  });
});

describe('demo rulesets', () => {
  // Issue 9, "Done when": the demo rulebooks use at least proportional plates, sides, ultrasonic walls
  // and a legacy date, and each decides a verdict (the rulebooks and their sections are invented).
  type Doc = { requirements: { id: string; requires: Record<string, unknown> }[] };
  const docs = [loadJson('rulesets/tarnwick-vale-mc-cage-regulations-2027.json'), loadJson('rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json')] as Doc[];
  const uses = (pred: (r: Record<string, unknown>) => boolean) => docs.flatMap((d) => d.requirements.filter((r) => pred(r.requires)).map((r) => r.id));
  test('use proportional plates, per-side counts, ultrasonic walls and a legacy date', () => {
    expect(uses((q) => JSON.stringify(q.checks ?? []).includes('"times"'))).toEqual(['tv-plates-welded']);
    expect(uses((q) => JSON.stringify(q.members ?? []).includes('"side"'))).toEqual(['hc-members']);
    expect(uses((q) => (q.measuredWall as { method?: string } | undefined)?.method === 'ultrasonic')).toEqual(['tv-heavy-tubes', 'hc-main-tubes']);
    expect(uses((q) => JSON.stringify(q.bands ?? []).includes('"approvedBefore"'))).toEqual(['hc-main-tubes']);
  });
  const hill = (members: Record<string, unknown>[], cage: Record<string, unknown> = {}) =>
    check(metric, { vehicle: { classId: 'hill-saloon' }, cage, geometry: { rearBraceAngleFromVerticalDeg: 35 }, members });
  const hoop = (id: string, kind: string, odMm: number, wallMm: number, extra: Record<string, unknown> = {}) => ({ id, kind, odMm, wallMm, material: 'mild_steel', process: 'cds', ...extra });
  test('hillclimb H1.2.1: a backstay on each side, counted per side (two on the left fail)', async () => {
    const sonic = { wallReadings: [{ wallMm: 2.4, method: 'ultrasonic' }] };
    const base = [hoop('mh', 'main_hoop', 45, 2.5, sonic), hoop('fh', 'front_hoop', 45, 2.5, sonic), hoop('dg', 'diagonal', 38, 2.5)];
    const oneSide = await hill([...base, hoop('b1', 'rear_brace', 45, 2.5, { ...sonic, side: 'left' }), hoop('b2', 'rear_brace', 45, 2.5, { ...sonic, side: 'left' })]);
    expect(finding(oneSide, 'hc-members').verdict).toBe('fail');
    const both = await hill([...base, hoop('b1', 'rear_brace', 45, 2.5, { ...sonic, side: 'left' }), hoop('b2', 'rear_brace', 45, 2.5, { ...sonic, side: 'right' })]);
    expect(finding(both, 'hc-members').verdict).toBe('pass');
  });
  test('hillclimb H2.1.1: a sonic reading 0.25 mm under the listed wall at most (2.25 mm on 2.5 mm), and 40 × 2.0 mm only for cages approved before 1 Jan 2000', async () => {
    const sonic = (wallMm: number) => ({ wallReadings: [{ wallMm, method: 'ultrasonic' }] });
    expect(finding(await hill([hoop('mh', 'main_hoop', 45, 2.5, sonic(2.25))]), 'hc-main-tubes', 'mh').verdict).toBe('pass');
    // 2.15 mm is beyond the 0.05 mm measurement tolerance too: the reading limit is not widened by it.
    const newCage = { approvedOn: '2026-02-01' };
    expect(finding(await hill([hoop('mh', 'main_hoop', 45, 2.5, sonic(2.15))], newCage), 'hc-main-tubes', 'mh').verdict).toBe('fail');
    // Without an approval date the legacy 40 × 2.0 mm row (reading ≥ 1.75 mm) might still take it: not a pass, not a fail.
    expect(finding(await hill([hoop('mh', 'main_hoop', 45, 2.5, sonic(2.15))]), 'hc-main-tubes', 'mh').verdict).toBe('needs_information');
    expect(finding(await hill([hoop('mh', 'main_hoop', 40, 2.0, sonic(1.9))], { approvedOn: '1998-05-14' }), 'hc-main-tubes', 'mh').verdict).toBe('pass');
    expect(finding(await hill([hoop('mh', 'main_hoop', 40, 2.0, sonic(1.9))], { approvedOn: '2003-05-14' }), 'hc-main-tubes', 'mh').verdict).toBe('fail');
    expect(finding(await hill([hoop('mh', 'main_hoop', 40, 2.0, sonic(1.9))]), 'hc-main-tubes', 'mh').verdict).toBe('needs_information');
  });

  test('every document in rulesets/ validates, and has at least three classes in the main one', () => {
    expect(Object.keys(demo.classes)).toEqual(['open-sprint', 'club-saloon', 'heavy-special']);
    expect(demo.requirements.length).toBeGreaterThanOrEqual(15);
    expect(metric.document.unitSystem).toBe('metric');
  });
});
