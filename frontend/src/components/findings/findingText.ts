// Words for findings: verdicts with their icon, areas in the trade's terms, and measured and required
// values in the builder's units (the report carries canonical values with their dimension).
// Direct module imports (not the domain's index) keep the rules engine out of the pages that only show results.
import { formatQuantity } from '@domain/units';
import type { UnitSystem } from '@domain/units';
import { MEMBER_KIND_LABELS } from '@domain/vocabulary';
import type { MemberKind } from '@domain/vocabulary';
import type { CheckReport, Finding, MeasuredValue, RequiredValue } from '@contracts/report';
import type { RequirementArea } from '@contracts/ruleset';
import { valueLabel } from '@/components/sheet/sheetLabels';

export type AnyVerdict = Finding['verdict'] | CheckReport['verdict'];

export const VERDICT_WORDS: Record<AnyVerdict, { label: string; icon: string }> = {
  pass: { label: 'Meets the rule', icon: 'pi pi-check-circle' },
  fail: { label: 'Does not meet it', icon: 'pi pi-times-circle' },
  needs_information: { label: 'Needs a measurement', icon: 'pi pi-question-circle' },
  not_applicable: { label: 'Does not apply', icon: 'pi pi-minus-circle' },
};

export const OVERALL_WORDS: Record<CheckReport['verdict'], string> = {
  pass: 'Every mandatory rule is met',
  fail: 'Some mandatory rules are not met',
  needs_information: 'More measurements needed to decide',
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
  if (value && typeof value === 'object' && 'fact' in value) return String((value as { fact: string }).fact);
  return String(value);
}

export function showRequired(r: RequiredValue, units: UnitSystem): string {
  return [OPERATOR_WORDS[r.operator], showValue(r.value, r.dimension, units)].filter(Boolean).join(' ');
}

/** "Main hoop (main-hoop-1)", "Plate plate-1", or null for the vehicle as a whole. */
export function subjectOf(f: Finding): string | null {
  if (f.member) return `${capitalise(MEMBER_KIND_LABELS[f.member.kind as MemberKind])} (${f.member.id})`;
  if (f.plate) return `Plate ${f.plate.id} at ${f.plate.location.replace(/_/g, ' ')}`;
  return null;
}

export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Findings grouped by area in the order builders think about a cage; empty areas left out. */
export function groupByArea(findings: readonly Finding[]): { area: RequirementArea; label: string; findings: Finding[] }[] {
  return AREA_ORDER.map((area) => ({ area, label: AREA_LABELS[area], findings: findings.filter((f) => f.area === area) })).filter(
    (g) => g.findings.length > 0,
  );
}
