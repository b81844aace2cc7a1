// The one registry of rule kinds: every kind the schema accepts is known to the registry, the
// compiler, the compare view, the editor's tabs and the docs, and an example of each compiles to at
// least one comparison (so no kind can silently drop a requirement).
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { requiresSchema } from '@backend/contracts/ruleset';
import type { Requirement, Requires } from '@backend/contracts/ruleset';
import { TEMPLATE_KINDS, TEMPLATE_NAMES } from '@backend/domain/rules/template-kinds';
import type { TemplateName } from '@backend/domain/rules/template-kinds';
import { validateRulesetDocument, compileRuleset } from '@backend/domain/index';
import { describeRequiresChanges, TEMPLATE_WORDS } from '@backend/domain/rulebook/diff-requires';

// Typed as a Record over every kind: a new kind without an example here fails the type-check.
const EXAMPLES: Record<TemplateName, { scope: Requirement['scope']; requires: Requires; changed: Requires }> = {
  tube_table: {
    scope: { kind: 'member', memberKinds: ['main_hoop'] },
    requires: { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 45, wall: 2.5 }] }] }] },
    changed: { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 45, wall: 3 }] }] }] },
  },
  required_members: {
    scope: { kind: 'vehicle' },
    requires: { template: 'required_members', members: [{ kinds: ['main_hoop'], min: 1 }] },
    changed: { template: 'required_members', members: [{ kinds: ['main_hoop'], min: 2 }] },
  },
  limit: {
    scope: { kind: 'plate', locations: ['main_hoop_foot'] },
    requires: { template: 'limit', checks: [{ fact: 'plate.thicknessMm', operator: 'atLeast', value: 3 }] },
    changed: { template: 'limit', checks: [{ fact: 'plate.thicknessMm', operator: 'atLeast', value: 4 }] },
  },
  allowed_values: {
    scope: { kind: 'member', memberKinds: ['main_hoop'] },
    requires: { template: 'allowed_values', fact: 'member.process', mode: 'allowed', values: ['dom'] },
    changed: { template: 'allowed_values', fact: 'member.process', mode: 'allowed', values: ['dom', 'seamless'] },
  },
  conditions: {
    scope: { kind: 'vehicle' },
    requires: { template: 'conditions', conditions: { all: [{ fact: 'padding.nearHelmet', operator: 'equal', value: true }] } },
    changed: { template: 'conditions', conditions: { all: [{ fact: 'padding.nearHelmet', operator: 'equal', value: false }] } },
  },
  member_match: {
    scope: { kind: 'member', memberKinds: ['rear_brace'] },
    requires: { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }] },
    changed: { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }, { measure: 'wall', operator: 'equals' }] },
  },
};

const doc = (scope: Requirement['scope'], requires: Requires) => ({
  formatVersion: 1,
  rulebook: { publisher: 'Test', title: 'Kinds', edition: '1', effectiveDate: '2027-01-01' },
  unitSystem: 'metric',
  classes: [{ id: 'c', name: 'C', weightBasis: 'with_driver' }],
  requirements: [{ id: 'r', title: 'R', section: '1', severity: 'mandatory', area: 'members', scope, requires, explanation: '' }],
});

describe('rule kind registry', () => {
  test('lists exactly the templates the schema accepts', () => {
    const schemaNames = requiresSchema.options.map((o) => o.shape.template.value).sort();
    expect([...TEMPLATE_NAMES].sort()).toEqual(schemaNames);
  });

  test('docs/rulesets.md documents every kind under its heading', () => {
    const docs = readFileSync(new URL('../../../../docs/rulesets.md', import.meta.url), 'utf8');
    for (const name of TEMPLATE_NAMES) expect(docs, name).toContain(TEMPLATE_KINDS[name].docsHeading);
  });

  test.each(TEMPLATE_NAMES)('%s: an example compiles to a rule with comparisons', (name) => {
    const { scope, requires } = EXAMPLES[name];
    const v = validateRulesetDocument(doc(scope, requires));
    expect(v.ok ? [] : v.problems).toEqual([]);
    if (!v.ok) return;
    const compiled = compileRuleset(v.document);
    expect(compiled.requirements).toHaveLength(1);
    expect(compiled.requirements[0]!.template).toBe(name);
    expect(Object.keys(compiled.requirements[0]!.leaves).length).toBeGreaterThan(0);
  });

  test.each(TEMPLATE_NAMES)('%s: refused in a scope it does not allow, at the scope path', (name) => {
    const allowed = TEMPLATE_KINDS[name].scopes;
    const other = (['vehicle', 'member', 'plate'] as const).find((s) => !allowed.includes(s));
    if (!other) return expect(allowed).toHaveLength(3);
    const scope: Requirement['scope'] = other === 'vehicle' ? { kind: 'vehicle' } : other === 'member' ? { kind: 'member', memberKinds: ['main_hoop'] } : { kind: 'plate', locations: ['other'] };
    const v = validateRulesetDocument(doc(scope, EXAMPLES[name].requires));
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems).toContainEqual({ path: 'requirements.0.scope', message: TEMPLATE_KINDS[name].scopeMessage });
  });

  // The editor's "Add a rule" starts from the registry's starter: what the admin must still choose is
  // refused at its path (the section always; a tube table's sizes; a limit's first measurement), and
  // nothing else is, so a new rule can never be put in force with a value nobody typed.
  const MUST_FILL: Record<TemplateName, string[]> = {
    tube_table: ['requirements.0.requires.bands.0.rows.0.alternatives.0.od', 'requirements.0.requires.bands.0.rows.0.alternatives.0.wall'],
    required_members: [],
    limit: ['requirements.0.requires.checks'],
    allowed_values: [],
    conditions: [],
    member_match: [],
  };
  test.each(TEMPLATE_NAMES)('%s: its starter is refused only where the admin must choose, in a scope its kind allows', (name) => {
    const { scope, requires, area, label } = TEMPLATE_KINDS[name].starter;
    expect(TEMPLATE_KINDS[name].scopes).toContain(scope.kind);
    expect(label.length).toBeGreaterThan(5);
    const d = doc(scope, structuredClone(requires));
    d.requirements[0]!.section = '';
    d.requirements[0]!.area = area;
    const v = validateRulesetDocument(d);
    expect(v.ok ? [] : v.problems.map((p) => p.path).sort()).toEqual(['requirements.0.section', ...MUST_FILL[name]].sort());
  });

  test.each(TEMPLATE_NAMES)('%s: the compare view has words for it and sees a change', (name) => {
    expect(TEMPLATE_WORDS[name]).toBe(TEMPLATE_KINDS[name].words);
    const side = { system: 'metric', display: 'metric' } as const;
    const changes: string[] = [];
    describeRequiresChanges(EXAMPLES[name].requires, side, EXAMPLES[name].requires, side, (_k, d) => changes.push(d));
    expect(changes).toEqual([]);
    describeRequiresChanges(EXAMPLES[name].requires, side, EXAMPLES[name].changed, side, (_k, d) => changes.push(d));
    expect(changes.length).toBeGreaterThan(0);
  });
});
