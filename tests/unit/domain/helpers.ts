// Test helpers: load a fixture or demo ruleset, compile it, and check a small specification.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { compileRuleset, evaluateSpecification, validateRulesetDocument } from '@backend/domain/index';
import type { CompiledRuleset } from '@backend/domain/index';
import { parseSpecification } from '@backend/contracts/specification';
import type { CheckReport, Finding } from '@backend/contracts/report';

const root = fileURLToPath(new URL('../../../', import.meta.url));

export function loadJson(relative: string): Record<string, unknown> {
  return JSON.parse(readFileSync(root + relative, 'utf8')) as Record<string, unknown>;
}

export function compileFile(relative: string, patch: Record<string, unknown> = {}): CompiledRuleset {
  const v = validateRulesetDocument({ ...loadJson(relative), ...patch });
  if (!v.ok) throw new Error(`${relative} is invalid: ${JSON.stringify(v.problems)}`);
  return compileRuleset(v.document);
}

export async function check(compiled: CompiledRuleset, spec: unknown): Promise<CheckReport> {
  const parsed = parseSpecification(spec);
  if (!parsed.ok) throw new Error(`spec invalid: ${JSON.stringify(parsed.problems)}`);
  return evaluateSpecification(compiled, parsed.value.vehicle.classId, parsed.value);
}

export function finding(report: CheckReport, requirementId: string, subjectId?: string): Finding {
  const f = report.findings.find((x) => x.requirementId === requirementId && (subjectId === undefined || x.member?.id === subjectId || x.plate?.id === subjectId));
  if (!f) throw new Error(`no finding ${requirementId}/${subjectId ?? '-'} in ${report.findings.map((x) => `${x.requirementId}/${x.member?.id ?? x.plate?.id ?? '-'}`).join(', ')}`);
  return f;
}

export const IN = 25.4;
export const LB = 0.45359237;
