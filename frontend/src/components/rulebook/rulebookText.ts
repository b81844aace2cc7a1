// Words and small helpers of the rulebook editor: version states in our own words, units of a
// document, labels of member kinds and materials, and problem paths made readable.
import type { DocumentProblem, RequirementArea, RequirementScope, RulesetDocument } from '@contracts/ruleset';
import { DEFAULT_UNIT } from '@domain/units';
import { MATERIAL_LABELS, MEMBER_KIND_LABELS, type MemberKind, type PlateLocation } from '@domain/vocabulary';

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

/** The report's area headings, for the area a rule is listed under. */
export const AREA_WORDS: Readonly<Record<RequirementArea, string>> = {
  tubes: 'Tubes', members: 'Members', geometry: 'Geometry', mounting: 'Mounting', padding: 'Padding', welding: 'Welding', material: 'Material',
};

export const PLATE_LOCATION_WORDS: Readonly<Record<PlateLocation, string>> = {
  main_hoop_foot: 'main hoop feet', front_hoop_foot: 'front hoop feet', rear_brace_foot: 'rear brace (backstay) feet', lateral_hoop_foot: 'lateral hoop feet', other: 'other plates',
};

/** What a rule is checked for, in words: the whole car, each member of some kinds, each plate at some places. */
export const SCOPE_WORDS: Readonly<Record<RequirementScope['kind'], string>> = {
  vehicle: 'the whole car (once)',
  member: 'each member of the kinds ticked',
  plate: 'each mounting plate at the places ticked',
};
