// Words for findings: verdicts with their icon, areas in the trade's terms, and measured and required
// values in the builder's units (the report carries canonical values with their dimension).
// Direct module imports (not the domain's index) keep the rules engine out of the pages that only show results.
import { referenceWords } from '@domain/rules/reference-words';
import { formatQuantity } from '@domain/units';
import type { UnitSystem } from '@domain/units';
import { MEMBER_KIND_LABELS } from '@domain/vocabulary';
import type { MemberKind } from '@domain/vocabulary';
import type { CheckReport, Finding, MeasuredValue, RequiredValue } from '@contracts/report';
import type { RequirementArea } from '@contracts/ruleset';
import { CHECK_VERDICT_WORDS, FINDING_VERDICT_WORDS } from '@contracts/verdict-words';
import { valueLabel } from '@/components/sheet/sheetLabels';

export type AnyVerdict = Finding['verdict'] | CheckReport['verdict'] | 'waived';

// The words are the server's (contracts/verdict-words.ts), so the screens, the PDF and the mail agree.
export const VERDICT_WORDS: Record<AnyVerdict, { label: string; icon: string }> = {
  pass: { label: FINDING_VERDICT_WORDS.pass, icon: 'pi pi-check-circle' },
  fail: { label: FINDING_VERDICT_WORDS.fail, icon: 'pi pi-times-circle' },
  needs_information: { label: FINDING_VERDICT_WORDS.needs_information, icon: 'pi pi-question-circle' },
  not_applicable: { label: FINDING_VERDICT_WORDS.not_applicable, icon: 'pi pi-minus-circle' },
  waived: { label: FINDING_VERDICT_WORDS.waived, icon: 'pi pi-file-check' },
};

export const OVERALL_WORDS: Record<CheckReport['verdict'], string> = {
  pass: CHECK_VERDICT_WORDS.pass.summary,
  fail: CHECK_VERDICT_WORDS.fail.summary,
  needs_information: CHECK_VERDICT_WORDS.needs_information.summary,
};

/** The short overall verdicts (CHECK_VERDICT_WORDS.short). */
export const SHORT_VERDICT_WORDS: Record<CheckReport['verdict'], string> = {
  pass: CHECK_VERDICT_WORDS.pass.short,
  fail: CHECK_VERDICT_WORDS.fail.short,
  needs_information: CHECK_VERDICT_WORDS.needs_information.short,
};

export const AREA_LABELS: Record<RequirementArea, string> = {
  tubes: 'Tube sizes',
  members: 'Members present',
  geometry: 'Geometry',
  mounting: 'Mounting',
  padding: 'Padding',
  welding: 'Welding',
  material: 'Material',
};

export const AREA_ORDER: readonly RequirementArea[] = ['tubes', 'members', 'geometry', 'mounting', 'padding', 'welding', 'material'];

const OPERATOR_WORDS: Record<RequiredValue['operator'], string> = {
  atLeast: 'at least', atMost: 'at most', above: 'more than', below: 'less than', equals: '', notEquals: 'not',
  oneOf: 'one of', noneOf: 'none of', includes: 'including', excludes: 'without',
};

export function showValue(value: unknown, dimension: MeasuredValue['dimension'], units: UnitSystem): string {
  if (typeof value === 'number' && dimension) return formatQuantity(value, dimension, units).text;
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return value.map((v) => valueLabel(String(v))).join(', ');
  if (typeof value === 'string') return valueLabel(value);
  // Another value of the check: "the largest OD of the main hoop", "2 × OD of the attached member".
  if (value && typeof value === 'object' && 'fact' in value) return referenceWords(value as { fact: string; times?: number }, units);
  return String(value);
}

export function showRequired(r: RequiredValue, units: UnitSystem): string {
  return [OPERATOR_WORDS[r.operator], showValue(r.value, r.dimension, units)].filter(Boolean).join(' ');
}

/**
 * The member by the builder's name ("Backstay left"), "Plate plate-1", or null for the vehicle as a
 * whole. Runs stored before names were carried fall back to the kind and the id.
 */
export function subjectOf(f: Finding): string | null {
  if (f.member) return f.member.name ? capitalise(f.member.name) : `${capitalise(MEMBER_KIND_LABELS[f.member.kind as MemberKind])} (${f.member.id})`;
  if (f.plate) return `Plate ${f.plate.id} at ${f.plate.location.replace(/_/g, ' ')}`;
  return null;
}

export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

export type VerdictFilter = 'all' | 'not_met' | 'needs_information' | 'met' | 'not_applicable';

/** The verdict groups in the order a builder fixes things: what is not met first. */
export const VERDICT_GROUPS: readonly { value: Exclude<VerdictFilter, 'all'>; label: string; verdicts: readonly Finding['verdict'][] }[] = [
  { value: 'not_met', label: capitalise(CHECK_VERDICT_WORDS.fail.outcome), verdicts: ['fail'] },
  { value: 'needs_information', label: FINDING_VERDICT_WORDS.needs_information, verdicts: ['needs_information'] },
  { value: 'met', label: capitalise(CHECK_VERDICT_WORDS.pass.outcome), verdicts: ['pass'] },
  { value: 'not_applicable', label: 'Do not apply', verdicts: ['not_applicable'] },
];

/**
 * Findings by verdict group, not met first (a mandatory fail before an advisory one), each group in
 * the areas' order. "All" leaves out the rules that do not apply; they have a filter of their own.
 */
export function groupByVerdict(findings: readonly Finding[], filter: VerdictFilter): { value: string; label: string; findings: Finding[] }[] {
  const area = (f: Finding) => AREA_ORDER.indexOf(f.area);
  return VERDICT_GROUPS.filter((g) => (filter === 'all' ? g.value !== 'not_applicable' : g.value === filter))
    .map((g) => ({
      value: g.value,
      label: g.label,
      findings: findings
        .filter((f) => g.verdicts.includes(f.verdict))
        .sort((a, b) => Number(a.severity === 'advisory') - Number(b.severity === 'advisory') || area(a) - area(b)),
    }))
    .filter((g) => g.findings.length > 0);
}
