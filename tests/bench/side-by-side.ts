// Side-by-side bench (issue 13 §5): one sheet against 5 rulebooks must take at most 5 × the time of one
// check, both measured in this run. Both go the way the server goes, through the check engine with
// the compiled-ruleset cache (here the in-process engine, on one thread; the server runs the same
// jobs in a worker): one check is the `evaluate` job (the sheet parsed, evaluated, its report
// serialised), the five are one `compare` job (the sheet parsed once, evaluated under each rulebook,
// the reports laid side by side by domain/compare/side-by-side.ts where they were made). The five rulebooks are the 40-requirement bench ruleset
// with their tube tables moved apart, so each is a compilation of its own and the comparison has
// real differences to mark. Run: npx tsx --tsconfig tsconfig.json tests/bench/side-by-side.ts
import type { RulesetDocument } from '../../backend/src/contracts/ruleset.js';
import { compileRuleset } from '../../backend/src/domain/rules/compile.js';
import { validateRulesetDocument } from '../../backend/src/domain/rules/validate.js';
import type { CompiledRuleset } from '../../backend/src/domain/rules/types.js';
import { createInProcessEngine } from '../../backend/src/services/check-engine.js';
import { createCompiledRulesetCache, compiledCacheKey, type CacheKeyParts } from '../../backend/src/services/compiled-ruleset-cache.js';
import { buildBenchRuleset, buildBenchSpecification } from './fixtures.js';

export const RULEBOOKS = 5;
/** The five together against one check: at most 5× (issue 13 §5). */
export const MAX_RATIO = 5;

/** The bench ruleset with every listed OD scaled by `factor` and its own edition. */
function variant(doc: RulesetDocument, i: number): RulesetDocument {
  const copy = JSON.parse(JSON.stringify(doc)) as RulesetDocument;
  copy.rulebook = { ...copy.rulebook, title: `Bench rulebook ${i + 1}`, edition: `B${i + 1}` };
  for (const r of copy.requirements) {
    if (r.requires.template !== 'tube_table') continue;
    for (const band of r.requires.bands) for (const row of band.rows) for (const alt of row.alternatives) alt.od = alt.od * (1 - 0.01 * i);
  }
  const v = validateRulesetDocument(copy);
  if (!v.ok) throw new Error(`bench variant ${i} is invalid: ${JSON.stringify(v.problems)}`);
  return v.document;
}

async function medianMs(fn: () => Promise<unknown>, runs: number): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

export interface SideBySideBenchResult {
  rulebooks: number;
  oneCheckMs: number;
  fiveMs: number;
  ratio: number;
  rows: number;
}

export async function runSideBySideBench(options: { log?: boolean; runs?: number } = {}): Promise<SideBySideBenchResult> {
  const runs = options.runs ?? 41;
  const base = buildBenchRuleset().document;
  const documents = Array.from({ length: RULEBOOKS }, (_, i) => variant(base, i));
  const versions: CacheKeyParts[] = documents.map((_, i) => ({ id: `00000000-0000-4000-8000-00000000000${i}`, status: 'published', lockVersion: 1 }));
  const byId = new Map(versions.map((v, i) => [v.id, documents[i]!]));
  const cache = createCompiledRulesetCache();
  const compile = (v: CacheKeyParts): Promise<CompiledRuleset> => cache.get(compiledCacheKey(v), async () => compileRuleset(byId.get(v.id)!));
  const engine = createInProcessEngine(compile, () => cache.stats().compiles);
  const spec = buildBenchSpecification();
  const classId = spec.vehicle.classId;

  // The baseline: one check against each of the five, one after another (a builder checking five
  // times); one check is a fifth of that, so each rulebook weighs the same on both sides.
  const fiveSingleChecks = async () => {
    for (const version of versions) await engine.evaluate({ version, classId, specification: spec, unitSystem: 'imperial' });
  };
  // The five as the server runs them: one `compare` job of the same engine (parsed once, evaluated
  // under each, the reports read where they were made and the matrix built there).
  const columns = versions.map((version, i) => ({ version, classId, home: i === 0 }));
  const five = () => engine.compare({ columns, specification: spec, unitSystem: 'imperial' });

  // Warm: every rulebook compiled once, the code paths hot, before anything is timed.
  const sample = (await five()).comparison;
  for (let i = 0; i < 5; i++) {
    await fiveSingleChecks();
    await five();
  }
  // Interleaved, so a change in the machine's load falls on both alike.
  const ones: number[] = [];
  const fives: number[] = [];
  for (let i = 0; i < runs; i++) {
    ones.push((await medianMs(fiveSingleChecks, 1)) / RULEBOOKS);
    fives.push(await medianMs(five, 1));
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
  const oneCheckMs = median(ones);
  const fiveMs = median(fives);
  const result = { rulebooks: RULEBOOKS, oneCheckMs, fiveMs, ratio: fiveMs / oneCheckMs, rows: sample.rows.length };
  if (options.log) console.log(`side by side: one check ${oneCheckMs.toFixed(2)} ms, ${RULEBOOKS} rulebooks ${fiveMs.toFixed(2)} ms (${result.ratio.toFixed(2)}×, ${result.rows} rows)`);
  return result;
}

if (process.argv[1] && import.meta.url === new URL(`file://${process.argv[1]}`).href) {
  const r = await runSideBySideBench({ log: true });
  console.log(`  ${r.ratio <= MAX_RATIO ? 'ok  ' : 'MISS'}  one sheet against ${r.rulebooks} rulebooks, median: ${r.fiveMs.toFixed(1)} ms, ${r.ratio.toFixed(2)}× one check (${r.oneCheckMs.toFixed(1)} ms)  [target ≤ ${MAX_RATIO}× one check]`);
  if (r.ratio > MAX_RATIO) process.exitCode = 1;
}
