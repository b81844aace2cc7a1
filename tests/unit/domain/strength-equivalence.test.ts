// Equivalence by strength: a tube judged against a listed size by section modulus (F-ENG-1) and, where
// the yields are known, by bending strength (yield × Z); the ruleset option that makes it count
// (`strengthEquivalents`, distinct from `acceptPrintedEquivalents`), advice where it is off, and every
// step of the calculation with its units. Z values checked against F-ENG-4/F-ENG-5 (TC-29), yields
// against F-MAT-1 (ASTM A513 minimums) and F-MSUK-1 (350 N/mm²).
import { describe, expect, test } from 'vitest';
import { validateRulesetDocument } from '@backend/domain/index';
import { judgeStrengthEquivalence, strengthEquivalenceProblems, strengthEquivalenceSteps } from '@backend/domain/strength-equivalence';
import { renderReason } from '@backend/domain/rules/reason-text';
import { IN, check, compileFile, finding, loadJson } from './helpers';

/** F-ENG-1, written out here: Z = π(D⁴ − d⁴)/(32·D). */
const zOf = (D: number, t: number) => (Math.PI * (D ** 4 - (D - 2 * t) ** 4)) / (32 * D);

describe('section modulus against the published worked values', () => {
  test.each([
    // F-ENG-5 (derived, metric FIA sizes) and TC-29.
    [45, 2.5, 3361],
    [50, 2.0, 3480],
    [38, 2.5, 2323],
    [40, 2.0, 2161],
    [44.45, 2.413, 3178],
  ])('%d × %d mm → Z %d mm³ (F-ENG-5)', (od, wall, z) => {
    const e = judgeStrengthEquivalence({ odMm: od, wallMm: wall }, { odMm: 45, wallMm: 2.5 }, 'section_modulus');
    expect(e.candidate.sectionModulusMm3).toBeCloseTo(z, -0.5);
    expect(e.candidate.sectionModulusMm3).toBeCloseTo(zOf(od, wall), 9);
  });
  test('1.750 × 0.120 in → Z 0.2345 in³ (F-ENG-4, TC-29)', () => {
    const e = judgeStrengthEquivalence({ odMm: 1.75 * IN, wallMm: 0.12 * IN }, { odMm: 45, wallMm: 2.5 }, 'section_modulus');
    expect(e.candidate.sectionModulusMm3 / IN ** 3).toBeCloseTo(0.2345, 4);
  });
});

describe('judging an alternative against a listed size', () => {
  test('50 × 2.0 against 45 × 2.5 by section modulus: 3480 ÷ 3361 = 1.035, equivalent (F-ENG-5)', () => {
    const e = judgeStrengthEquivalence({ odMm: 50, wallMm: 2 }, { odMm: 45, wallMm: 2.5 }, 'section_modulus');
    expect(e.ratio).toBeCloseTo(zOf(50, 2) / zOf(45, 2.5), 12);
    expect(e.ratio).toBeCloseTo(1.035, 3);
    expect(e.equivalent).toBe(true);
  });
  test('1.75 × 0.095 in (44.45 × 2.413 mm) against 45 × 2.5: about 5 % less Z, not equivalent (F-ENG-5, F-UNIT-2)', () => {
    const e = judgeStrengthEquivalence({ odMm: 1.75 * IN, wallMm: 0.095 * IN }, { odMm: 45, wallMm: 2.5 }, 'section_modulus');
    expect(e.ratio).toBeCloseTo(3178 / 3361, 2);
    expect(e.equivalent).toBe(false);
  });
  test('40 × 2.0 against 38 × 2.5: less Z (2161 < 2323 mm³, F-ENG-5), not equivalent; 38 × 3.0 is (2678 mm³)', () => {
    expect(judgeStrengthEquivalence({ odMm: 40, wallMm: 2 }, { odMm: 38, wallMm: 2.5 }, 'section_modulus').equivalent).toBe(false);
    expect(judgeStrengthEquivalence({ odMm: 38, wallMm: 3 }, { odMm: 38, wallMm: 2.5 }, 'section_modulus').equivalent).toBe(true);
  });
  test('by bending strength: 40 × 2.0 at 586 MPa (4130 mandrel-drawn, F-MAT-1) beats 38 × 2.5 at 350 MPa (F-FIA-1)', () => {
    const e = judgeStrengthEquivalence({ odMm: 40, wallMm: 2, yieldMpa: 586 }, { odMm: 38, wallMm: 2.5, yieldMpa: 350 }, 'bending_strength');
    expect(e.candidate.bendingStrengthNmm).toBeCloseTo(586 * zOf(40, 2), 6);
    expect(e.ratio).toBeCloseTo((586 * zOf(40, 2)) / (350 * zOf(38, 2.5)), 12);
    expect(e.ratio).toBeCloseTo(1.557, 2);
    expect(e.equivalent).toBe(true);
  });
  test('by bending strength: the same size in as-welded 1020 ERW (262 MPa, F-MAT-1) against 350 MPa is weaker', () => {
    const e = judgeStrengthEquivalence({ odMm: 45, wallMm: 2.5, yieldMpa: 262 }, { odMm: 45, wallMm: 2.5, yieldMpa: 350 }, 'bending_strength');
    expect(e.ratio).toBeCloseTo(262 / 350, 12);
    expect(e.equivalent).toBe(false);
  });
  test('without the alternative’s yield bending strength is undecided, never a pass', () => {
    const e = judgeStrengthEquivalence({ odMm: 60, wallMm: 3 }, { odMm: 45, wallMm: 2.5, yieldMpa: 350 }, 'bending_strength');
    expect(e.ratio).toBeNull();
    expect(e.equivalent).toBe('unknown');
  });
  test('a least wall turns away a stronger but thinner tube', () => {
    expect(judgeStrengthEquivalence({ odMm: 60, wallMm: 1.5 }, { odMm: 45, wallMm: 2.5 }, 'section_modulus').equivalent).toBe(true);
    expect(judgeStrengthEquivalence({ odMm: 60, wallMm: 1.5 }, { odMm: 45, wallMm: 2.5 }, 'section_modulus', 2).equivalent).toBe(false);
  });
  test('bad input is named at its field', () => {
    expect(strengthEquivalenceProblems({ odMm: 40, wallMm: 20 }, { odMm: 45, wallMm: 2.5 }, 'bending_strength').map((p) => p.field)).toEqual(['candidate.wallMm', 'listed.yieldMpa']);
    expect(strengthEquivalenceProblems({ odMm: 40, wallMm: 2, yieldMpa: -5 }, { odMm: 45, wallMm: 2.5 }, 'section_modulus').map((p) => p.field)).toEqual(['candidate.yieldMpa']);
  });
});

describe('every step with its units', () => {
  const e = judgeStrengthEquivalence({ odMm: 40, wallMm: 2, yieldMpa: 586 }, { odMm: 38, wallMm: 2.5, yieldMpa: 350 }, 'bending_strength');
  const lines = (system: 'metric' | 'imperial') => strengthEquivalenceSteps(e).map((l) => renderReason(l, system));
  test('metric: inside diameters, Z of both in mm³, M of both in N·m, the ratio and the verdict', () => {
    const text = lines('metric');
    expect(text[0]).toBe('Listed size: 38 × 2.5 mm. Inside diameter d = D − 2t = 38.0 mm − 2 × 2.50 mm = 33.0 mm.');
    expect(text[1]).toMatch(/^Section modulus of the listed size: Z = π\(D⁴ − d⁴\) \/ \(32 × D\) = π × \(\(38\.0 mm\)⁴ − \(33\.0 mm\)⁴\) \/ \(32 × 38\.0 mm\) = 2323 mm³\.$/);
    expect(text[3]).toMatch(/= 2161 mm³\.$/);
    // 350 MPa × 2323 mm³ = 813,050 N·mm = 813 N·m; 586 × 2161 = 1,266 N·m (computed).
    expect(text[4]).toBe('Bending strength of the listed size: M = yield × Z = 350 MPa × 2323 mm³ = 813 N·m.');
    expect(text[5]).toBe('Bending strength of the alternative: M = yield × Z = 586 MPa × 2161 mm³ = 1266 N·m.');
    expect(text[6]).toBe('Ratio: M of the alternative ÷ M of the listed size = 1266 N·m ÷ 813 N·m = 1.56 (at least 1.00).');
    expect(text.at(-1)).toBe('Equivalent by bending strength (yield × section modulus): at least as strong as the listed size.');
  });
  test('imperial: the same steps in in, in³, psi and lbf·in', () => {
    const text = lines('imperial').join('\n');
    expect(text).toContain('1.496 in − 2 × 0.098 in = 1.299 in');
    expect(text).toMatch(/0\.1418 in³/);
    expect(text).toMatch(/50763 psi × 0\.1418 in³ = \d+ lbf·in/);
  });
});

describe('the ruleset option (Motorsport UK NCR 2026 fixture, F-MSUK-2: 45 × 2.5 or 50 × 2.0 mm)', () => {
  const cds = { material: 'mild_steel', process: 'cds', yieldMpa: 350 };
  const spec = (od: number, wall: number, extra: Record<string, unknown> = cds) => ({
    vehicle: { classId: 'new_cage' }, cage: { approvedOn: '2026-02-01' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: od, wallMm: wall, ...extra }],
  });
  const off = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json');
  const bySection = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json', { strengthEquivalents: { accept: true, measure: 'section_modulus' } });
  const byStrength = compileFile('tests/fixtures/rulesets/msuk-ncr-2026.json', { strengthEquivalents: { accept: true, measure: 'bending_strength', listedYield: { value: 350, unit: 'MPa' } } });

  test('omitted (the default): a 48 × 2.4 mm hoop fails the table, with advice that it is equivalent by section modulus', async () => {
    // Z(48 × 2.4) = 3734 mm³ ≥ Z(45 × 2.5) = 3361 mm³ (F-ENG-1, computed; F-ENG-5).
    expect(zOf(48, 2.4)).toBeGreaterThan(zOf(45, 2.5));
    const r = await check(off, spec(48, 2.4));
    const f = finding(r, 'msuk-mandatory-size', 'mh');
    expect(f.verdict).toBe('fail');
    expect(f.reason).toMatch(/Advisory only: by section modulus this tube is equivalent to 45 × 2\.5 mm: Z 3734 mm³ \(at least 3361 mm³\)\. This rulebook does not accept equivalents by strength, so the finding stands; only the sanctioning body can accept it\./);
    expect(f.strengthEquivalence).toMatchObject({ measure: 'section_modulus', accepted: false, equivalent: true, listed: { odMm: 45, wallMm: 2.5 } });
    expect(r.policy.strengthEquivalents).toEqual({ accept: false, measure: 'section_modulus' });
  });
  test('accepted by section modulus: the same hoop passes and says why; the report names the policy', async () => {
    const r = await check(bySection, spec(48, 2.4));
    const f = finding(r, 'msuk-mandatory-size', 'mh');
    expect(f.verdict).toBe('pass');
    expect(f.reason).toBe('Equivalent by section modulus to 45 × 2.5 mm: Z 3734 mm³ (at least 3361 mm³). This rulebook accepts a tube at least as strong as a listed size (equivalence by strength).');
    expect(f.strengthEquivalence).toMatchObject({ accepted: true, equivalent: true });
    expect(r.policy.strengthEquivalents).toEqual({ accept: true, measure: 'section_modulus' });
  });
  test('a listed size still matches as itself, not as an equivalent', async () => {
    expect(finding(await check(bySection, spec(45, 2.5)), 'msuk-mandatory-size', 'mh').reason).toBe('Matches 45 × 2.5 mm.');
  });
  test('TC-11’s 1.75 × 0.095 in is not equivalent either way: it fails, and says how close it came', async () => {
    const f = finding(await check(bySection, spec(1.75 * IN, 0.095 * IN)), 'msuk-mandatory-size', 'mh');
    expect(f.verdict).toBe('fail');
    expect(f.reason).toMatch(/Nor is it equivalent by section modulus: the closest is 45 × 2\.5 mm at a ratio of 0\.95\./);
    expect(finding(await check(off, spec(1.75 * IN, 0.095 * IN)), 'msuk-mandatory-size', 'mh').reason).not.toMatch(/Advisory only/);
  });
  test('accepted by bending strength: 45 × 2.2 mm 1020 DOM (414 MPa, F-MAT-1) passes against 45 × 2.5 at 350 MPa; without a yield it is undecided', async () => {
    // 414 × Z(45 × 2.2) = 414 × 3018 = 1,249,600 N·mm ≥ 350 × 3361 = 1,176,300 N·mm (computed).
    expect(414 * zOf(45, 2.2)).toBeGreaterThan(350 * zOf(45, 2.5));
    const pass = finding(await check(byStrength, spec(45, 2.2, { material: 'mild_steel', process: 'cds', yieldMpa: 414 })), 'msuk-mandatory-size', 'mh');
    expect(pass.verdict).toBe('pass');
    expect(pass.reason).toMatch(/^Equivalent by bending strength \(yield × section modulus\) to 45 × 2\.5 mm: yield × Z 1250 N·m \(at least 1176 N·m\)\./);
    const unknown = finding(await check(byStrength, spec(45, 2.2, { material: 'mild_steel', process: 'cds' })), 'msuk-mandatory-size', 'mh');
    expect(unknown.verdict).toBe('needs_information');
    expect(unknown.missing.map((m) => m.fact)).toEqual(['member.yieldMpa']);
  });
  test('as-welded ERW (262 MPa, F-MAT-1) of the same size is not strong enough by bending strength', async () => {
    const f = finding(await check(byStrength, spec(45, 2.2, { material: 'mild_steel', process: 'cds', yieldMpa: 262 })), 'msuk-mandatory-size', 'mh');
    expect(f.verdict).toBe('fail');
  });
  test('the option is distinct from acceptPrintedEquivalents, and bad values are refused at their path', () => {
    const doc = loadJson('tests/fixtures/rulesets/msuk-ncr-2026.json');
    const bad = validateRulesetDocument({ ...doc, strengthEquivalents: { accept: true, measure: 'bending_strength' } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.problems.map((p) => p.path)).toContain('strengthEquivalents.listedYield');
    const unit = validateRulesetDocument({ ...doc, strengthEquivalents: { accept: true, measure: 'section_modulus', minWall: { value: 2, unit: 'kg' } } });
    expect(unit.ok).toBe(false);
    if (!unit.ok) expect(unit.problems.map((p) => p.path)).toContain('strengthEquivalents.minWall.unit');
    const stray = validateRulesetDocument({ ...doc, strengthEquivalents: { accept: true, measure: 'weight' } });
    expect(stray.ok).toBe(false);
    if (!stray.ok) expect(stray.problems.map((p) => p.path)).toContain('strengthEquivalents.measure');
  });
});
