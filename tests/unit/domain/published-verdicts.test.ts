// Published versions never change their verdicts (issue 9 §3): the ruleset documents as they were
// published before issue 9 (the demo rulebooks and the fixtures standing for published rulebooks),
// checked on sheets an older builder could have saved and on one with the fields added since (sides,
// dates, the included angle, two fixings), give today exactly the verdicts the engine gave then —
// finding by finding. The verdicts were recorded by running scripts/verdict-baseline.ts against the
// tree of the commit named in the file, the last one before issue 9's changes to the compiler.
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { compileRuleset, evaluateSpecification, validateRulesetDocument } from '@backend/domain/index';
import type { CompiledRuleset } from '@backend/domain/index';
import { parseSpecification } from '@backend/contracts/specification';

interface Baseline {
  commit: string;
  documents: Record<string, unknown>;
  cases: { file: string; classId: string; variant: string; specification: unknown; verdict: string; findings: [string, string | null, string][] }[];
}

const baseline = JSON.parse(readFileSync(new URL('../../fixtures/verdicts/before-issue-9.json', import.meta.url), 'utf8')) as Baseline;

const compiled = new Map<string, CompiledRuleset>();
function compiledFor(file: string): CompiledRuleset {
  let c = compiled.get(file);
  if (!c) {
    const v = validateRulesetDocument(baseline.documents[file]);
    if (!v.ok) throw new Error(`${file} (as published) no longer validates: ${JSON.stringify(v.problems)}`);
    c = compileRuleset(v.document);
    compiled.set(file, c);
  }
  return c;
}

describe(`documents published before issue 9 (verdicts recorded at ${baseline.commit})`, () => {
  test('the baseline covers every verdict and both unit systems', () => {
    const verdicts = new Set(baseline.cases.flatMap((c) => c.findings.map((f) => f[2])));
    expect([...verdicts].sort()).toEqual(['fail', 'needs_information', 'not_applicable', 'pass']);
    const systems = new Set(Object.values(baseline.documents).map((d) => (d as { unitSystem: string }).unitSystem));
    expect([...systems].sort()).toEqual(['imperial', 'metric']);
    expect(baseline.cases.length).toBeGreaterThan(30);
  });

  test.each(baseline.cases.map((c) => [`${c.file} · ${c.classId} · ${c.variant}`, c] as const))('%s: the same verdict for every finding', async (_name, c) => {
    const parsed = parseSpecification(c.specification);
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
    const report = await evaluateSpecification(compiledFor(c.file), c.classId, parsed.value);
    expect(report.findings.map((f) => [f.requirementId, f.member?.id ?? f.plate?.id ?? null, f.verdict])).toEqual(c.findings);
    expect(report.verdict).toBe(c.verdict);
  });
});
