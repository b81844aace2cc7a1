// The one list of rule kinds (requirement templates) and what every part of the product must know
// about each: its words in the compare view, the editor tab it belongs to, its heading in
// docs/rulesets.md, the scopes it may be used in and how its findings are written. Typed as a
// Record over the schema's template names, so a kind added to the schema and forgotten here fails
// the type-check; the compiler and the rulebook diff keep their own Records over the same names
// (templates.ts, rulebook/diff-requires.ts), and tests/unit/domain/rules/template-kinds.test.ts
// checks the schema, the docs and an example of every kind. Pure data: the browser imports it too.
import type { Requires } from '../../contracts/ruleset.js';
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
}

const ANY_SCOPE: readonly FactScope[] = ['vehicle', 'member', 'plate'];

export const TEMPLATE_KINDS: Readonly<Record<TemplateName, TemplateKind>> = {
  tube_table: {
    words: 'tube table', editorGroup: 'tubes', docsHeading: '### `tube_table`', scopes: ['member'],
    scopeMessage: 'A tube table applies to members: scope it to member kinds.', findings: 'tube_sizes',
  },
  required_members: {
    words: 'required members', editorGroup: 'members', docsHeading: '### `required_members`', scopes: ['vehicle'],
    scopeMessage: 'Required members are counted for the whole vehicle: use scope "vehicle".', findings: 'comparisons',
  },
  limit: {
    words: 'limits', editorGroup: 'limits', docsHeading: '### `limit`', scopes: ANY_SCOPE, scopeMessage: '', findings: 'comparisons',
  },
  allowed_values: {
    words: 'allowed values', editorGroup: 'other', docsHeading: '### `allowed_values`', scopes: ANY_SCOPE, scopeMessage: '', findings: 'comparisons',
  },
  conditions: {
    words: 'conditions', editorGroup: 'other', docsHeading: '### `conditions`', scopes: ANY_SCOPE, scopeMessage: '', findings: 'comparisons',
  },
  member_match: {
    words: 'member against member', editorGroup: 'members', docsHeading: '### `member_match`', scopes: ['member'],
    scopeMessage: 'Member against member compares each member of the scope with others: scope it to member kinds.', findings: 'comparisons',
  },
};

export const TEMPLATE_NAMES = Object.keys(TEMPLATE_KINDS) as TemplateName[];
