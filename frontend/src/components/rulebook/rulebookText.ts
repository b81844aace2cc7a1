// Words and small helpers of the rulebook editor: version states in our own words, units of a
// document, labels of member kinds and materials, and problem paths made readable.
import type { DocumentProblem, RulesetDocument } from '@contracts/ruleset';
import { DEFAULT_UNIT } from '@domain/units';
import { MATERIAL_LABELS, MEMBER_KIND_LABELS, type MemberKind } from '@domain/vocabulary';

import { EDITION_STATUS_WORDS, type EditionStatusKey } from '@contracts/edition-words';

export { editionDateText } from '@contracts/edition-words';

export type VersionStatus = EditionStatusKey;

/** The edition states in words, shared with the server's e-mails (contracts/edition-words.ts). */
export const STATUS_WORDS = EDITION_STATUS_WORDS;

export function documentUnits(doc: Pick<RulesetDocument, 'unitSystem'>): { length: string; mass: string; angle: string; area: string } {
  const d = DEFAULT_UNIT[doc.unitSystem];
  return { length: d.length, mass: d.mass, angle: d.angle, area: d.area };
}

export const memberKindLabel = (kind: string): string => MEMBER_KIND_LABELS[kind as MemberKind] ?? kind;
export const materialLabel = (m: string): string => (MATERIAL_LABELS as Record<string, string>)[m] ?? m;

/** Problems whose path starts with `prefix`, for showing them beside the field they concern. */
export function problemsUnder(problems: readonly DocumentProblem[], prefix: string): DocumentProblem[] {
  return problems.filter((p) => p.path === prefix || p.path.startsWith(`${prefix}.`));
}

export function problemAt(problems: readonly DocumentProblem[], path: string): string | undefined {
  return problems.find((p) => p.path === path)?.message;
}
