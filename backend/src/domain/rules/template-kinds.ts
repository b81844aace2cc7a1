// The one list of rule kinds (requirement templates) and what every part of the product must know
// about each: its words in the compare view, the editor tab it belongs to, its heading in
// docs/rulesets.md, the scopes it may be used in and how its findings are written. Typed as a
// Record over the schema's template names, so a kind added to the schema and forgotten here fails
// the type-check; the compiler and the rulebook diff keep their own Records over the same names
// (templates.ts, rulebook/diff-requires.ts), and tests/unit/domain/rules/template-kinds.test.ts
// checks the schema, the docs and an example of every kind. Pure data: the browser imports it too.
import type { RequirementArea, RequirementScope, Requires } from '../../contracts/ruleset.js';
import type { FactScope } from '../facts.js';

export type TemplateName = Requires['template'];
export type TemplateOf<K extends TemplateName> = Extract<Requires, { template: K }>;

/** Tabs of the rulebook editor that hold requirements. */
export type EditorGroup = 'tubes' | 'members' | 'limits' | 'other';

export interface TemplateKind {
  /** Words for the compare view ("rule rewritten: limits → tube table"). */
  words: string;
  editorGroup: EditorGroup;
  /** The heading that documents it in docs/rulesets.md (checked by a test). */
  docsHeading: string;
  /** Scopes a requirement of this kind may have; refused elsewhere with `scopeMessage`. */
  scopes: readonly FactScope[];
  scopeMessage: string;
  /** `tube_sizes`: the finding names the matched or nearest listed size; `comparisons`: each failing comparison. */
  findings: 'tube_sizes' | 'comparisons';
  /**
   * A new rule of this kind, as the editor's "Add a rule" starts it (copied, never shared). Numbers the
   * admin must choose start at 0, which validation refuses at their paths, so a rule cannot be put in
   * force with a value nobody typed.
   */
  starter: { label: string; area: RequirementArea; scope: RequirementScope; requires: Requires };
}

const ANY_SCOPE: readonly FactScope[] = ['vehicle', 'member', 'plate'];

export const TEMPLATE_KINDS: Readonly<Record<TemplateName, TemplateKind>> = {
  tube_table: {
    words: 'tube table', editorGroup: 'tubes', docsHeading: '### `tube_table`', scopes: ['member'],
    scopeMessage: 'A tube table applies to members: scope it to member kinds.', findings: 'tube_sizes',
    starter: {
      label: 'Tube sizes (a table by weight and material)', area: 'tubes', scope: { kind: 'member', memberKinds: ['main_hoop'] },
      requires: { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 0, wall: 0 }] }] }] },
    },
  },
  required_members: {
    words: 'required members', editorGroup: 'members', docsHeading: '### `required_members`', scopes: ['vehicle'],
    scopeMessage: 'Required members are counted for the whole vehicle: use scope "vehicle".', findings: 'comparisons',
    starter: {
      label: 'Members the cage must have', area: 'members', scope: { kind: 'vehicle' },
      requires: { template: 'required_members', members: [{ kinds: ['main_hoop'], min: 1 }] },
    },
  },
  limit: {
    words: 'limits', editorGroup: 'limits', docsHeading: '### `limit`', scopes: ANY_SCOPE, scopeMessage: '', findings: 'comparisons',
    starter: {
      label: 'Limits on measurements', area: 'geometry', scope: { kind: 'vehicle' },
      // No measurement is chosen for the admin: validation asks for the first limit until one is added.
      requires: { template: 'limit', checks: [] },
    },
  },
  allowed_values: {
    words: 'allowed values', editorGroup: 'other', docsHeading: '### `allowed_values`', scopes: ANY_SCOPE, scopeMessage: '', findings: 'comparisons',
    starter: {
      label: 'Allowed values (edit in the JSON view)', area: 'material', scope: { kind: 'member', memberKinds: ['main_hoop'] },
      requires: { template: 'allowed_values', fact: 'member.process', mode: 'allowed', values: ['dom', 'seamless'] },
    },
  },
  conditions: {
    words: 'conditions', editorGroup: 'other', docsHeading: '### `conditions`', scopes: ANY_SCOPE, scopeMessage: '', findings: 'comparisons',
    starter: {
      label: 'Conditions (edit in the JSON view)', area: 'padding', scope: { kind: 'vehicle' },
      requires: { template: 'conditions', conditions: { all: [{ fact: 'padding.nearHelmet', operator: 'equal', value: true }] } },
    },
  },
  member_match: {
    words: 'member against member', editorGroup: 'members', docsHeading: '### `member_match`', scopes: ['member'],
    scopeMessage: 'Member against member compares each member of the scope with others: scope it to member kinds.', findings: 'comparisons',
    starter: {
      label: 'Member against member (braces the same size as the hoop)', area: 'tubes', scope: { kind: 'member', memberKinds: ['rear_brace'] },
      requires: { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }, { measure: 'wall', operator: 'equals' }] },
    },
  },
};

export const TEMPLATE_NAMES = Object.keys(TEMPLATE_KINDS) as TemplateName[];
