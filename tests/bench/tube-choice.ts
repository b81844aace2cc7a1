// Tube chooser bench: choosing the lightest legal tube over 200 stock sizes under the 40-requirement
// bench ruleset, for one member (the main hoop, which has the most tube-dependent requirements) and
// for the whole 15-member bench sheet. Baseline from the same run: one full engine check of the sheet
// (evaluateSpecification), and what an engine run per stock size would cost for the one member.
// Also the whole sheet when a rule compares members (rear braces equal to the hoop), which tries the
// hoop's sizes on the sheet with the braces changed to match.
// Target: one member's choice ≤ 5 ms (issue 11). Run: npx tsx --tsconfig tsconfig.json tests/bench/tube-choice.ts
import { compileRuleset } from '../../backend/src/domain/rules/compile.js';
import { evaluateSpecification } from '../../backend/src/domain/rules/evaluate.js';
import { COMMON_STOCK } from '../../backend/src/domain/common-stock.js';
import { memberWithTube, rankStockForMember } from '../../backend/src/domain/tube-choice.js';
import { chooseTubesForSheet } from '../../backend/src/domain/tube-choice-sheet.js';
import type { StockTube } from '../../backend/src/domain/tube-choice.js';
import { buildBenchRuleset, buildBenchSpecification } from './fixtures.js';

export const TUBE_CHOICE_TARGET_MS = 5;

/** 200 distinct sizes: the common sizes, then each again 0.002 in heavier in the wall (a second mill's tolerance). */
export function benchStock(): StockTube[] {
  const out: StockTube[] = [...COMMON_STOCK];
  for (let i = 0; out.length < 200; i++) {
    const t = COMMON_STOCK[i % COMMON_STOCK.length];
    out.push({ ...t, wallMm: t.wallMm + 0.0508 * (1 + Math.floor(i / COMMON_STOCK.length)) });
  }
  return out;
}

async function medianMs(fn: () => unknown, runs: number): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

export interface TubeChoiceBenchResult {
  stockSizes: number;
  requirements: number;
  memberMs: number;
  sheetMs: number;
  /** The whole sheet when a rule compares members (rear braces equal to the hoop), so the hoop's sizes are tried on the sheet. */
  sheetMatchedMs: number;
  members: number;
  engineCheckMs: number;
  enginePerSizeMs: number;
}

export async function runTubeChoiceBench(options: { log?: boolean } = {}): Promise<TubeChoiceBenchResult> {
  const { document } = buildBenchRuleset();
  const compiled = compileRuleset(document);
  const spec = buildBenchSpecification();
  const stock = benchStock();
  if (new Set(stock.map((t) => `${t.odMm}|${t.wallMm}|${t.material}|${t.process}`)).size !== 200) throw new Error('bench stock is not 200 distinct sizes');
  const hoop = spec.members.findIndex((m) => m.kind === 'main_hoop');
  const one = () => rankStockForMember(compiled, spec, hoop, stock, { materials: ['mild_steel'] }).find((c) => c.status === 'legal');
  const chosen = one();
  if (!chosen) throw new Error('the bench sheet has no legal main hoop tube in the bench stock');
  // Sanity: the full engine passes the choice's tube-dependent findings for the hoop.
  const fitted = { ...spec, members: spec.members.map((m, i) => (i === hoop ? memberWithTube(m, chosen.tube) : m)) };
  const report = await evaluateSpecification(compiled, 'bench', fitted);
  const bad = report.findings.filter((f) => f.member?.id === spec.members[hoop].id && f.verdict === 'fail');
  if (bad.length > 0) throw new Error(`the chosen tube fails ${bad.map((f) => f.requirementId).join(', ')} in the full check`);

  for (let i = 0; i < 30; i++) one(); // warm-up
  const memberMs = await medianMs(one, 60);
  for (let i = 0; i < 20; i++) chooseTubesForSheet(compiled, spec, stock); // warm-up
  const sheetMs = await medianMs(() => chooseTubesForSheet(compiled, spec, stock), 30);
  // The same ruleset and a rule comparing members: the rear braces the same OD and wall as the main hoop (F-NHRA-G1).
  const matchedDoc = { ...document, requirements: [...document.requirements, { id: 'brace-match', title: 'Braces as the hoop', section: 'B41', severity: 'mandatory', area: 'tubes', scope: { kind: 'member', memberKinds: ['rear_brace'] }, requires: { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }, { measure: 'wall', operator: 'equals' }] }, explanation: 'bench' }] } as typeof document;
  const matched = compileRuleset(matchedDoc);
  for (let i = 0; i < 5; i++) chooseTubesForSheet(matched, spec, stock); // warm-up
  const sheetMatchedMs = await medianMs(() => chooseTubesForSheet(matched, spec, stock), 15);
  const engineCheckMs = await medianMs(() => evaluateSpecification(compiled, 'bench', spec), 40);
  // The approach the plain reading replaces: one engine check per stock size (20 sizes timed, per size).
  const sizes = stock.slice(0, 20);
  const enginePerSizeMs = (await medianMs(async () => {
    for (const t of sizes) await evaluateSpecification(compiled, 'bench', { ...spec, members: spec.members.map((m, i) => (i === hoop ? memberWithTube(m, t) : m)) });
  }, 5)) / sizes.length;
  const result = { stockSizes: stock.length, requirements: document.requirements.length, memberMs, sheetMs, sheetMatchedMs, members: spec.members.length, engineCheckMs, enginePerSizeMs };
  if (options.log)
    console.log(`tube chooser: ${stock.length} sizes, ${document.requirements.length} requirements; one member ${memberMs.toFixed(2)} ms, whole sheet (${spec.members.length} members) ${sheetMs.toFixed(1)} ms (${(sheetMs / engineCheckMs).toFixed(2)}× one engine check), with braces matched to the hoop ${sheetMatchedMs.toFixed(1)} ms; one full engine check ${engineCheckMs.toFixed(2)} ms; engine per size ${enginePerSizeMs.toFixed(2)} ms (× 200 = ${(enginePerSizeMs * 200).toFixed(0)} ms)`);
  return result;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const r = await runTubeChoiceBench({ log: true });
  process.exitCode = r.memberMs <= TUBE_CHOICE_TARGET_MS ? 0 : 1;
}
