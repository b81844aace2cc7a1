// validateRulesetDocument: each kind of bad document is rejected with the JSON path of the problem.
import { describe, expect, test } from 'vitest';
import { validateRulesetDocument, compileRuleset, RulesetInvalidError } from '@backend/domain/index';
import { loadJson } from './helpers';

const base = () => structuredClone(loadJson('tests/fixtures/rulesets/msuk-ncr-2026.json')) as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any -- test documents are mutated freely
const problemsOf = (doc: unknown) => {
  const v = validateRulesetDocument(doc);
  if (v.ok) throw new Error('expected the document to be rejected');
  return v.problems;
};

describe('validateRulesetDocument', () => {
  test('the fixture is valid', () => {
    expect(validateRulesetDocument(base()).ok).toBe(true);
  });

  test.each<[string, (d: Record<string, any>) => void, string, RegExp]>([ // eslint-disable-line @typescript-eslint/no-explicit-any
    ['requirement without section', (d) => delete d.requirements[3].section, 'requirements.3.section', /./],
    ['empty section', (d) => (d.requirements[3].section = '  '), 'requirements.3.section', /Required/],
    ['unknown fact', (d) => (d.requirements[2].requires.checks[0].fact = 'member.yieldKsi'), 'requirements.2.requires.checks.0.fact', /Unknown fact "member.yieldKsi"/],
    ['member fact in a vehicle requirement', (d) => (d.requirements[9].requires.checks[1].fact = 'member.odMm'), 'requirements.9.requires.checks.1.fact', /member fact/],
    ['unknown operator in raw conditions', (d) => (d.requirements[8].requires.conditions.all[1].operator = 'atLeastish'), 'requirements.8.requires.conditions.all.1.operator', /Unknown operator/],
    ['operator unsuited to the fact', (d) => (d.requirements[8].requires.conditions.all[1].operator = 'contains'), 'requirements.8.requires.conditions.all.1.operator', /does not apply/],
    ['unknown member kind in scope', (d) => (d.requirements[0].scope.memberKinds[0] = 'roll_hoop'), 'requirements.0.scope.memberKinds.0', /./],
    ['unknown member kind in a counts path', (d) => (d.requirements[8].requires.conditions.all[0].path = 'backstay'), 'requirements.8.requires.conditions.all.0.path', /member kind/],
    ['unknown class', (d) => (d.requirements[0].appliesTo = { classes: ['old_cage'] }), 'requirements.0.appliesTo.classes.0', /Unknown class "old_cage"/],
    ['bad unit', (d) => (d.requirements[10].requires.checks[0].unit = 'acre'), 'requirements.10.requires.checks.0.unit', /Unknown unit "acre"/],
    ['unit of the wrong dimension', (d) => (d.requirements[10].requires.checks[0].unit = 'mm'), 'requirements.10.requires.checks.0.unit', /not a unit of area/],
    ['bad tube unit', (d) => (d.requirements[3].requires.bands[0].rows[0].alternatives[0].unit = 'kg'), 'requirements.3.requires.bands.0.rows.0.alternatives.0.unit', /not a unit of length/],
    ['absurd tube in a table', (d) => (d.requirements[3].requires.bands[0].rows[0].alternatives[0].wall = 30), 'requirements.3.requires.bands.0.rows.0.alternatives.0.wall', /half the outside diameter/],
    ['duplicate requirement id', (d) => (d.requirements[4].id = d.requirements[3].id), 'requirements.4.id', /already used/],
    ['duplicate class id', (d) => d.classes.push({ ...d.classes[0] }), 'classes.1.id', /already used/],
    ['enum value not in the vocabulary', (d) => (d.requirements[0].requires.values = ['mild_steel', 'titanium']), 'requirements.0.requires.values.1', /not a value of "member.material"/],
    ['boolean fact compared with a number', (d) => (d.requirements[11].requires.checks[0].value = 1), 'requirements.11.requires.checks.0.value', /true or false/],
    ['top-level leaf in raw conditions', (d) => (d.requirements[8].requires.conditions = { fact: 'geometry.rearBraceAngleFromVerticalDeg', operator: 'greaterThan', value: 30 }), 'requirements.8.requires.conditions', /top level/],
    ['named condition reference', (d) => (d.requirements[8].requires.conditions.all[0] = { condition: 'x' }), 'requirements.8.requires.conditions.all.0.condition', /not supported/],
    ['tube table scoped to the vehicle', (d) => (d.requirements[3].scope = { kind: 'vehicle' }), 'requirements.3.scope', /members/],
    ['bands out of order', (d) => (d.requirements[3].requires.bands = [{ upTo: 2000, rows: d.requirements[3].requires.bands[0].rows }, { upTo: 1000, rows: d.requirements[3].requires.bands[0].rows }]), 'requirements.3.requires.bands.1.upTo', /increasing/],
    ['format version', (d) => (d.formatVersion = 2), 'formatVersion', /./],
    ['bad effective date', (d) => (d.rulebook.effectiveDate = '1 Jan 2026'), 'rulebook.effectiveDate', /YYYY-MM-DD/],
  ])('%s → %s', (_name, mutate, path, message) => {
    const doc = base();
    mutate(doc);
    expect(problemsOf(doc)).toContainEqual({ path, message: expect.stringMatching(message) });
  });

  test('every problem is reported, not just the first', () => {
    const doc = base();
    doc.requirements[1].requires.fact = 'member.nope';
    doc.requirements[5].section = '';
    const paths = problemsOf(doc).map((p) => p.path);
    expect(paths).toContain('requirements.5.section');
    // semantic checks run once the structure is valid; fix the structure and the fact problem shows
    doc.requirements[5].section = 'x';
    expect(problemsOf(doc).map((p) => p.path)).toContain('requirements.1.requires.fact');
  });

  test('conditions deeper than 8 levels are rejected', () => {
    let node: Record<string, unknown> = { fact: 'geometry.rearBraceAngleFromVerticalDeg', operator: 'greaterThan', value: 30 };
    for (let i = 0; i < 9; i++) node = { all: [node] };
    const doc = base();
    doc.requirements[8].requires.conditions = node;
    expect(problemsOf(doc).some((p) => /at most 8 levels/.test(p.message))).toBe(true);
  });

  test('more than 500 requirements are rejected at "requirements"', () => {
    const doc = base();
    doc.requirements = Array.from({ length: 501 }, (_, i) => ({ ...doc.requirements[11], id: `r${i}` }));
    expect(problemsOf(doc)).toContainEqual({ path: 'requirements', message: expect.stringMatching(/500/) });
  });

  test('a hostile deeply nested document is refused without a stack overflow', () => {
    let deep: unknown = {};
    for (let i = 0; i < 100000; i++) deep = { all: [deep] };
    const doc = base();
    doc.requirements[8].requires.conditions = deep;
    expect(problemsOf(doc)[0].message).toMatch(/nested more than/);
  });

  test('not an object at all', () => {
    expect(problemsOf('hello')[0].path).toBe('');
    expect(problemsOf(null).length).toBeGreaterThan(0);
  });

  test('compileRuleset throws RulesetInvalidError carrying every problem', () => {
    const doc = base();
    doc.requirements[2].requires.checks[0].fact = 'member.nope';
    doc.requirements[4].id = doc.requirements[3].id;
    try {
      compileRuleset(doc as never);
      throw new Error('expected a throw');
    } catch (e) {
      expect(e).toBeInstanceOf(RulesetInvalidError);
      expect((e as RulesetInvalidError).problems.map((p) => p.path).sort()).toEqual(['requirements.2.requires.checks.0.fact', 'requirements.4.id']);
    }
  });
});

describe('docs/rulesets.md', () => {
  test('lists every fact of the catalogue', async () => {
    const { readFileSync } = await import('node:fs');
    const { FACT_CATALOGUE } = await import('@backend/domain/facts');
    const docs = readFileSync(new URL('../../../docs/rulesets.md', import.meta.url), 'utf8');
    for (const f of FACT_CATALOGUE) expect(docs).toContain(`\`${f.name}\``);
  });
});
