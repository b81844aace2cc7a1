// Lightest legal tube and listed sizes, checked against published tube tables (FACTS.md ids named
// beside each check) on the fixture rulesets that encode them.
import { describe, expect, test } from 'vitest';
import { TUBE_DEPENDENT_FACTS, lightestLegalTube, listedSizesForBand, memberWithTube, rankStockForMember } from '@backend/domain/tube-choice';
import { modelSpec } from '../../fixtures/fabrication-model';
import { chooseTubesForSheet } from '@backend/domain/tube-choice-sheet';
import type { StockTube } from '@backend/domain/tube-choice';
import { COMMON_STOCK } from '@backend/domain/common-stock';
import { IN, LB, check, compileFile, finding } from './helpers';

const scca = compileFile('tests/fixtures/rulesets/scca-gcr-quoted.json');
const msuk = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json');
const nhra = compileFile('tests/fixtures/rulesets/nhra-quoted.json');

const inch = (s: { odMm: number; wallMm: number }) => [Number((s.odMm / IN).toFixed(3)), Number((s.wallMm / IN).toFixed(3))];
const dom = (odIn: number, wallIn: number, extra: Partial<StockTube> = {}): StockTube => ({ odMm: odIn * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom', ...extra });
const cds = (odMm: number, wallMm: number, extra: Partial<StockTube> = {}): StockTube => ({ odMm, wallMm, material: 'mild_steel', process: 'cds', yieldMpa: 355, ...extra });

describe('listedSizesForBand: SCCA GCR §9.4 table (F-SCCA-T1, weight includes driver)', () => {
  const q = (lb: number) => listedSizesForBand(scca, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: lb * LB });

  test('1,701 – 2,699 lb: 1.500 × 0.095 or 1.625 × 0.080, plus 1.750 × 0.080 under the 0.250 in over-minimum rule; lightest first', () => {
    const r = q(2400);
    expect(r.status).toBe('listed');
    if (r.status !== 'listed') return;
    expect(r.sizes.map(inch)).toEqual([[1.625, 0.08], [1.5, 0.095], [1.75, 0.08]]);
    expect(r.sizes.map((s) => s.source)).toEqual(['table', 'table', 'allowance']);
    expect(r.sizes[2].odOrLarger).toBe(true);
    // Mass per length against F-ENG-2 (lb/ft = 10.68 (OD − t) t; 1 lb/ft = 1.4882 kg/m, F-UNIT-1).
    for (const s of r.sizes) expect(s.massPerMetreKg / 1.48816).toBeCloseTo(10.68 * (s.odMm / IN - s.wallMm / IN) * (s.wallMm / IN), 2);
    expect(r.sizes[0].bandLabel).toBe('1,701 – 2,699 lb');
  });

  test('the band edge is inclusive: 1,700 lb lists 1.375 × 0.080 (TC-04), 1,701 lb does not (TC-05)', () => {
    const at = q(1700);
    const over = q(1701);
    if (at.status !== 'listed' || over.status !== 'listed') throw new Error('not listed');
    expect(at.sizes.map(inch)[0]).toEqual([1.375, 0.08]);
    expect(over.sizes.map(inch)).not.toContainEqual([1.375, 0.08]);
  });

  test('2,700 lb and up: the thin-wall allowance (1.875 × 0.080) is the lightest, then 1.750 × 0.095, then 1.625 × 0.120', () => {
    const r = q(2750);
    if (r.status !== 'listed') throw new Error(r.status);
    expect(r.sizes.map(inch)).toEqual([[1.875, 0.08], [1.75, 0.095], [1.625, 0.12]]);
  });

  test('without a weight the band cannot be chosen; an unknown class is refused; a kind without a table has none', () => {
    expect(listedSizesForBand(scca, { classId: 'gcr_2008', memberKind: 'main_hoop' }).status).toBe('needs_weight');
    expect(listedSizesForBand(scca, { classId: 'gcr_2008', memberKind: 'door_bar', weightKg: 1000 }).status).toBe('no_table');
    expect(() => listedSizesForBand(scca, { classId: 'nope', memberKind: 'main_hoop', weightKg: 1000 })).toThrow(/Unknown class "nope"/);
  });
});

describe('listedSizesForBand by material: older SCCA table (F-SCCA-T2) and NHRA (F-NHRA-1)', () => {
  test('F-SCCA-T2 over 2,500 lb: mild steel 1.50 × 0.120; 4130 1.50 × 0.095 or 1.75 × 0.095', () => {
    const mild = listedSizesForBand(scca, { classId: 'gcr_pre1994', memberKind: 'main_hoop', weightKg: 2600 * LB, material: 'mild_steel' });
    const alloy = listedSizesForBand(scca, { classId: 'gcr_pre1994', memberKind: 'main_hoop', weightKg: 2600 * LB, material: 'chromoly_4130' });
    if (mild.status !== 'listed' || alloy.status !== 'listed') throw new Error('not listed');
    expect(mild.sizes.map(inch)).toEqual([[1.5, 0.12]]);
    expect(alloy.sizes.map(inch)).toEqual([[1.5, 0.095], [1.75, 0.095]]);
  });

  test('F-NHRA-1: 1-5/8 × 0.118 mild steel, 1-5/8 × 0.083 4130', () => {
    const mild = listedSizesForBand(nhra, { classId: 'roll_cage', memberKind: 'main_hoop', material: 'mild_steel' });
    const alloy = listedSizesForBand(nhra, { classId: 'roll_cage', memberKind: 'main_hoop', material: 'chromoly_4130' });
    const any = listedSizesForBand(nhra, { classId: 'roll_cage', memberKind: 'main_hoop' });
    if (mild.status !== 'listed' || alloy.status !== 'listed' || any.status !== 'listed') throw new Error('not listed');
    expect(mild.sizes.map(inch)).toEqual([[1.625, 0.118]]);
    expect(alloy.sizes.map(inch)).toEqual([[1.625, 0.083]]);
    expect(any.sizes.map((s) => s.materials)).toEqual([['chromoly_4130'], ['mild_steel']]);
  });

  test('F-MSUK-2: 45 × 2.5 or 50 × 2.0 mm; 50 × 2.0 is lighter (2.368 against 2.620 kg/m, F-ENG-5)', () => {
    const r = listedSizesForBand(msuk, { classId: 'new_cage', memberKind: 'main_hoop' });
    if (r.status !== 'listed') throw new Error(r.status);
    expect(r.sizes.map((s) => [s.odMm, s.wallMm])).toEqual([[50, 2], [45, 2.5]]);
    expect(r.sizes[0].massPerMetreKg).toBeCloseTo(2.368, 3);
    expect(r.sizes[1].massPerMetreKg).toBeCloseTo(2.62, 3);
  });

  test('a wall allowance lowers the least wall but not the printed one (F-SCORE-1: −0.010 in)', () => {
    const withAllowance = compileFile('tests/fixtures/rulesets/scca-gcr-quoted.json');
    const doc = structuredClone(withAllowance.document);
    const req = doc.requirements.find((r) => r.id === 'scca-t1-tubes')!;
    if (req.requires.template !== 'tube_table') throw new Error('not a table');
    req.requires.allowances = { wallAllowance: { value: 0.010 } };
    const compiled = compileFile('tests/fixtures/rulesets/scca-gcr-quoted.json', { requirements: doc.requirements });
    const r = listedSizesForBand(compiled, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: 2400 * LB });
    if (r.status !== 'listed') throw new Error(r.status);
    expect(r.sizes.map((s) => [s.wallMm / IN, s.minWallMm / IN].map((x) => Number(x.toFixed(3))))).toEqual([[0.08, 0.07], [0.095, 0.085]]);
    // …and a 1.625 × 0.072 in stock tube is then legal (0.072 ≥ 0.080 − 0.010).
    const best = lightestLegalTube([dom(1.625, 0.072), dom(1.625, 0.065)], compiled, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: 2400 * LB, member: { bends: [] } });
    expect(best && inch(best.tube)).toEqual([1.625, 0.072]);
  });
});

describe('lightestLegalTube', () => {
  test('F-SCCA-T1 at 2,400 lb: 1.625 × 0.083 DOM beats 1.500 × 0.095; 1.375 × 0.095 never qualifies (TC-02)', () => {
    const stock = [dom(1.5, 0.095), dom(1.375, 0.095), dom(1.625, 0.083), dom(1.75, 0.095), dom(1.5, 0.12)];
    const bends = { bends: [{ clrMm: 6 * IN }] };
    const best = lightestLegalTube(stock, scca, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: 2400 * LB, member: bends });
    expect(best && inch(best.tube)).toEqual([1.625, 0.083]);
    expect(best!.outcomes.find((o) => o.requirementId === 'scca-t1-tubes')!.matched).toBe('1.625 × 0.080 in');
    const none = lightestLegalTube([dom(1.375, 0.095)], scca, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: 2400 * LB, member: bends });
    // Without the bends the bend-radius rule cannot be decided, so no size is called legal.
    expect(lightestLegalTube(stock, scca, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: 2400 * LB })).toBeNull();
    expect(none).toBeNull();
  });

  test('F-NHRA-1: 1-5/8 × 0.095 mild fails, 0.120 mild passes; restricted to 4130, 1-5/8 × 0.083 (TC-19)', () => {
    const stock = [dom(1.625, 0.095), dom(1.625, 0.12), { ...dom(1.625, 0.083), material: 'chromoly_4130' as const, process: 'seamless' as const }, dom(1.5, 0.12)];
    // NHRA asks for TIG welding wherever any member is 4130 (nhra-4130-tig): the car's welding decides it.
    const car = { welding: { process: 'tig' as const } };
    const mild = lightestLegalTube(stock, nhra, { classId: 'roll_cage', memberKind: 'main_hoop', material: 'mild_steel' });
    const alloy = lightestLegalTube(stock, nhra, { classId: 'roll_cage', memberKind: 'main_hoop', material: 'chromoly_4130', car });
    const any = lightestLegalTube(stock, nhra, { classId: 'roll_cage', memberKind: 'main_hoop', car });
    expect(lightestLegalTube(stock, nhra, { classId: 'roll_cage', memberKind: 'main_hoop', material: 'chromoly_4130', car: { welding: { process: 'mig' } } })).toBeNull();
    expect(mild && inch(mild.tube)).toEqual([1.625, 0.12]);
    expect(alloy && inch(alloy.tube)).toEqual([1.625, 0.083]);
    expect(any?.tube.material).toBe('chromoly_4130');
  });

  test('F-MSUK-2 with process, material and yield (TC-09, TC-12, TC-30): only CDS carbon steel of known 350 N/mm² yield', () => {
    const stock = [cds(50, 2.0, { yieldMpa: undefined }), cds(45, 2.5, { material: 'chromoly_4130' }), cds(50, 2.0, { process: 'erw', yieldMpa: 262 }), cds(45, 2.5), cds(50, 2.5)];
    const ranked = rankStockForMember(msuk, { vehicle: { classId: 'new_cage' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 45, wallMm: 2.5, bends: [], continuousPiece: true, joints: [] }] }, 0, stock);
    expect(ranked.map((c) => [c.tube.odMm, c.tube.wallMm, c.tube.process, c.status])).toEqual([
      [50, 2, 'cds', 'undecided'], // yield not known: not chosen, listed with what is missing
      [50, 2, 'erw', 'fails'],
      [45, 2.5, 'cds', 'fails'], // 4130 is not unalloyed carbon steel (F-MSUK-1)
      [45, 2.5, 'cds', 'legal'],
      [50, 2.5, 'cds', 'legal'],
    ]);
    expect(ranked[0].outcomes.find((o) => o.requirementId === 'msuk-yield')!.missing).toEqual(['member.yieldMpa']);
  });

  test('bend radius: with a 135 mm CLR, 50 mm tube breaks "CLR ≥ 3 × OD" (TC-13), so 45 × 2.5 is chosen over the lighter 50 × 2.0', () => {
    const stock = [cds(50, 2.0), cds(45, 2.5)];
    const bent = lightestLegalTube(stock, msuk, { classId: 'new_cage', memberKind: 'main_hoop', member: { bends: [{ clrMm: 135, minOdMm: 44, maxOdMm: 45 }], continuousPiece: true, joints: [] } });
    const wide = lightestLegalTube(stock, msuk, { classId: 'new_cage', memberKind: 'main_hoop', member: { bends: [{ clrMm: 150, minOdMm: 44, maxOdMm: 45 }], continuousPiece: true, joints: [] } });
    expect(bent && [bent.tube.odMm, bent.tube.wallMm]).toEqual([45, 2.5]);
    expect(wide && [wide.tube.odMm, wide.tube.wallMm]).toEqual([50, 2]);
  });

  test('equivalence by strength: accepted, a lighter 55 × 1.8 mm of more Z than 45 × 2.5 is chosen and the engine passes it; off, it is not', async () => {
    // Z(55 × 1.8) = π(55⁴ − 51.4⁴)/(32 × 55) ≈ 3875 mm³ ≥ Z(45 × 2.5) = 3361 mm³ (F-ENG-1, F-ENG-5); 2.361 kg/m
    // against 2.368 kg/m for 50 × 2.0 (F-ENG-5; kg/m = 0.02466·(OD − t)·t, F-ENG-2 metric analogue).
    const accepted = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json', { strengthEquivalents: { accept: true, measure: 'section_modulus' } });
    const stock = [cds(50, 2.0), cds(45, 2.5), cds(55, 1.8)];
    const query = { classId: 'new_cage', memberKind: 'main_hoop' as const, member: { bends: [], continuousPiece: true, joints: [] } };
    const on = lightestLegalTube(stock, accepted, query);
    expect(on && [on.tube.odMm, on.tube.wallMm]).toEqual([55, 1.8]);
    expect(on!.outcomes.find((o) => o.requirementId === 'msuk-mandatory-size')!.matched).toBe('equivalent by section modulus to 45 × 2.5 mm');
    const off = lightestLegalTube(stock, msuk, query);
    expect(off && [off.tube.odMm, off.tube.wallMm]).toEqual([50, 2]);
    const report = await check(accepted, { vehicle: { classId: 'new_cage' }, cage: { approvedOn: '2026-02-01' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 55, wallMm: 1.8, material: 'mild_steel', process: 'cds', yieldMpa: 355, bends: [], continuousPiece: true, joints: [] }] });
    expect(finding(report, 'msuk-mandatory-size', 'mh').verdict).toBe('pass');
  });

  test('chooses in the query material from the common stock list, and refuses impossible stock sizes', () => {
    const best = lightestLegalTube([...COMMON_STOCK, { odMm: 40, wallMm: 20, material: 'mild_steel', process: 'dom' }], scca, { classId: 'gcr_2008', memberKind: 'main_hoop', weightKg: 2400 * LB, material: 'mild_steel', member: { bends: [{ clrMm: 6 * IN }] } });
    expect(best && inch(best.tube)).toEqual([1.625, 0.083]);
  });
});

describe('chooseTubesForSheet', () => {
  test('per member: current tube judged the same way, the lightest legal one in its material, and the saving', () => {
    const spec = {
      vehicle: { classId: 'gcr_2008', weightWithDriverKg: 2400 * LB },
      members: [
        { id: 'mh', kind: 'main_hoop' as const, odMm: 1.75 * IN, wallMm: 0.12 * IN, material: 'mild_steel' as const, process: 'dom' as const, lengthMm: 4000, bends: [{ clrMm: 6 * IN }] },
        { id: 'db', kind: 'door_bar' as const, odMm: 1.5 * IN, wallMm: 0.095 * IN, material: 'mild_steel' as const, process: 'dom' as const, bends: [] },
      ],
    };
    const [mh, db] = chooseTubesForSheet(scca, spec, COMMON_STOCK);
    expect(mh.current.status).toBe('legal');
    expect(mh.lightest && inch(mh.lightest.tube)).toEqual([1.625, 0.083]);
    expect(mh.lightest!.tube.material).toBe('mild_steel');
    // 1.750 × 0.120 is 2.089 lb/ft (F-ENG-4); 1.625 × 0.083 is 1.367 lb/ft: 0.722 lb/ft ≈ 1.074 kg/m.
    expect(mh.savingPerMetreKg! / 1.48816).toBeCloseTo(2.089 - 1.367, 2);
    expect(mh.savingKg).toBeCloseTo((mh.savingPerMetreKg! * 4000) / 1000, 9);
    // No requirement of this ruleset depends on a door bar's tube: every stock size is legal, the lightest wins.
    expect(db.lightest!.massPerMetreKg).toBe(Math.min(...db.legal.map((c) => c.massPerMetreKg)));
    expect(db.savingKg).toBeNull();
  });

  test('the tube on the sheet is judged on what the sheet states: no material is undecided under a material rule (F-MSUK-1)', () => {
    const spec = { vehicle: { classId: 'new_cage' }, members: [
      { id: 'l', kind: 'door_bar' as const, odMm: 40, wallMm: 2, process: 'cds' as const, yieldMpa: 355, bends: [], joints: [] },
      { id: 'r', kind: 'door_bar' as const, odMm: 40, wallMm: 2, process: 'cds' as const, yieldMpa: 355, bends: [], joints: [] },
    ] };
    const [l, r] = chooseTubesForSheet(msuk, spec, [cds(38, 2.5), cds(40, 2.0)]);
    expect(l.current.status).toBe('undecided');
    expect(l.current.outcomes.find((o) => o.requirementId === 'msuk-material')!.missing).toEqual(['member.material']);
    // Without a material on the sheet every material of the stock is considered; 40 × 2.0 is the lighter (F-ENG-5).
    expect(l.lightest && [l.lightest.tube.odMm, l.lightest.tube.wallMm]).toEqual([40, 2]);
    // The right-hand twin has the same facts and gets the same answer.
    expect(r.lightest).toEqual(l.lightest);
  });

  describe('members compared with each other (NHRA roll bar: rear braces the same OD and wall as the hoop, F-NHRA-G1; hoop at least 1.750 in, F-NHRA-2)', () => {
    // 4130 is TIG-welded only (F-NHRA-W1): the sheet says so, so the welding rule does not leave sizes undecided.
    const bar = (braceMaterial: 'mild_steel' | 'chromoly_4130' = 'mild_steel') => ({
      vehicle: { classId: 'roll_bar' }, welding: { process: 'tig' as const },
      members: [
        { id: 'mh', kind: 'main_hoop' as const, odMm: 1.75 * IN, wallMm: 0.134 * IN, material: 'mild_steel' as const, process: 'dom' as const, lengthMm: 3000 },
        { id: 'rb-l', kind: 'rear_brace' as const, odMm: 1.75 * IN, wallMm: 0.134 * IN, material: braceMaterial, process: 'dom' as const, lengthMm: 900 },
        { id: 'rb-r', kind: 'rear_brace' as const, odMm: 1.75 * IN, wallMm: 0.134 * IN, material: braceMaterial, process: 'dom' as const, lengthMm: 900 },
      ],
    });
    const stock = [dom(1.75, 0.095), dom(1.75, 0.12), dom(1.75, 0.134), dom(1.75, 0.134, { material: 'chromoly_4130' })];

    test('a lighter hoop comes with the braces changed to match, and the full check passes all three', async () => {
      const spec = bar();
      const [mh, l] = chooseTubesForSheet(nhra, spec, stock);
      expect(mh.lightest && inch(mh.lightest.tube)).toEqual([1.75, 0.095]);
      expect(mh.lightest!.leavesFailing).toEqual([]);
      expect(mh.lightest!.together.map((c) => [c.memberId, inch(c.tube.tube), c.because.requirementId])).toEqual([
        ['rb-l', [1.75, 0.095], 'nhra-bar-braces'],
        ['rb-r', [1.75, 0.095], 'nhra-bar-braces'],
      ]);
      // 2.089 → … lb/ft per F-ENG-2 for each of the three tubes: the saving together is the hoop's plus both braces'.
      const braces = mh.lightest!.together.reduce((sum, c) => sum + ((l.current.massPerMetreKg - c.tube.massPerMetreKg) * 900) / 1000, 0);
      expect(mh.savingTogetherKg).toBeCloseTo(mh.savingKg! + braces, 9);
      // The brace alone may only equal the hoop as it is now.
      expect(l.lightest && inch(l.lightest.tube)).toEqual([1.75, 0.134]);
      const fitted = { ...spec, members: spec.members.map((m) => ({ ...m, wallMm: 0.095 * IN })) };
      const report = await check(nhra, fitted);
      expect(report.findings.filter((f) => f.verdict === 'fail').map((f) => f.requirementId)).toEqual([]);
      expect(finding(report, 'nhra-bar-braces', 'rb-l').verdict).toBe('pass');
    });

    test('braces that no stock size in their material can match: the lighter hoop is not offered, and says which rule it would break', () => {
      const [mh] = chooseTubesForSheet(nhra, bar('chromoly_4130'), stock);
      // Only 1.750 × 0.134 is stocked in 4130: a 0.095 or 0.120 in hoop would leave both braces failing.
      expect(mh.lightest && inch(mh.lightest.tube)).toEqual([1.75, 0.134]);
      expect(mh.savingKg).toBeCloseTo(0, 9);
      const lighter = mh.legal.filter((c) => c.massPerMetreKg < mh.lightest!.massPerMetreKg);
      expect(lighter.map((c) => inch(c.tube))).toEqual([[1.75, 0.095], [1.75, 0.12]]);
      for (const c of lighter) expect(c.leavesFailing.map((f) => [f.memberId, f.requirement.requirementId])).toEqual([['rb-l', 'nhra-bar-braces'], ['rb-r', 'nhra-bar-braces']]);
      // With any material allowed, mild steel braces put it right.
      const [anyMh] = chooseTubesForSheet(nhra, bar('chromoly_4130'), stock, { anyMaterial: true });
      expect(anyMh.lightest && inch(anyMh.lightest.tube)).toEqual([1.75, 0.095]);
      expect(anyMh.lightest!.together.map((c) => c.tube.tube.material)).toEqual(['mild_steel', 'mild_steel']);
    });
  });

  test('a sheet with a cage model is judged on the model’s bends and lengths, as the check reads it (demo saloon rules)', async () => {
    const demo = compileFile('rulesets/tarnwick-vale-mc-cage-regulations-2027.json');
    // The fabrication model's hoop bent at 150 mm CLR (model), with a heavier wall than the class needs;
    // the sheet gives only the diameters measured at its two bends (ovality), not the bends themselves.
    const ovality = { clrMm: 150, minOdMm: 43.9, maxOdMm: 44.6 };
    const spec = { ...modelSpec, members: modelSpec.members.map((m) => ({ ...m, process: 'dom' as const, ...(m.id === 'mh' ? { wallMm: 0.12 * IN, bends: [ovality, ovality] } : {}) })) };
    const mh = chooseTubesForSheet(demo, spec, COMMON_STOCK).find((m) => m.memberId === 'mh')!;
    // The bend radius over OD comes from the model's 150 mm CLR (3.37 × 44.45 mm ≥ 3, F-SCCA-G3-like demo rule).
    expect(mh.current.status).toBe('legal');
    expect(mh.lightest && inch(mh.lightest.tube)).toEqual([1.75, 0.095]);
    expect(mh.savingKg).not.toBeNull();
    const fitted = { ...spec, members: spec.members.map((m) => (m.id === 'mh' ? memberWithTube(m, mh.lightest!.tube) : m)) };
    const report = await check(demo, fitted);
    const tubeDependent = new Set(demo.requirements.filter((r) => r.factsUsed.some((f) => TUBE_DEPENDENT_FACTS.has(f))).map((r) => r.id));
    const hoop = report.findings.filter((f) => f.member?.id === 'mh' && tubeDependent.has(f.requirementId));
    expect(hoop.length).toBeGreaterThan(2);
    expect(hoop.filter((f) => f.verdict === 'fail' || f.verdict === 'needs_information').map((f) => f.requirementId)).toEqual([]);
  });
});
