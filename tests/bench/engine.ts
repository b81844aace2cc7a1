// Engine bench: full checks per second of evaluateSpecification (as the app calls it) against the
// same 40 rules written as plain functions. Prints medians of several runs; exits non-zero below
// 500 checks/s. Run: npx tsx --tsconfig tsconfig.json tests/bench/engine.ts
import { compileRuleset } from '../../backend/src/domain/rules/compile.js';
import { evaluateSpecification } from '../../backend/src/domain/rules/evaluate.js';
import { memberFacts, memberTubeData, plateFacts, vehicleFacts } from '../../backend/src/domain/facts.js';
import type { FactSet } from '../../backend/src/domain/facts.js';
import { buildBenchRuleset, buildBenchSpecification } from './fixtures.js';
import type { BaselineRule } from './fixtures.js';

export const MIN_CHECKS_PER_SECOND = 500;

function baselineCheck(rules: readonly BaselineRule[], spec: ReturnType<typeof buildBenchSpecification>): { id: string; verdict: unknown }[] {
  const tubes = spec.members.map((m, i) => memberTubeData(m, i));
  const v = vehicleFacts(spec, { weightBasis: 'with_driver' }, tubes);
  const out: { id: string; verdict: unknown }[] = [];
  for (const r of rules) if (r.scope === 'vehicle') out.push({ id: r.id, verdict: r.check(v) });
  spec.members.forEach((m, i) => {
    const f: FactSet = Object.assign(Object.create(v) as FactSet, memberFacts(spec, m, tubes[i]));
    for (const r of rules) if (r.scope === 'member' && r.kinds?.includes(m.kind)) out.push({ id: r.id, verdict: r.check(f) });
  });
  for (const p of spec.plates ?? []) {
    const f: FactSet = Object.assign(Object.create(v) as FactSet, plateFacts(spec, p));
    for (const r of rules) if (r.scope === 'plate') out.push({ id: r.id, verdict: r.check(f) });
  }
  return out;
}

interface Rate {
  /** Per second of wall-clock time. */
  wall: number;
  /** Per second of this process's CPU time: close to the idle-machine figure when other work shares the cores. */
  cpu: number;
}

async function perSecond(fn: () => unknown, minMs: number): Promise<Rate> {
  let n = 0;
  const start = performance.now();
  const cpu0 = process.cpuUsage();
  while (performance.now() - start < minMs) {
    await fn();
    n += 1;
  }
  const cpu = process.cpuUsage(cpu0);
  return { wall: (n * 1000) / (performance.now() - start), cpu: (n * 1e6) / (cpu.user + cpu.system) };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

export interface EngineBenchResult {
  checksPerSecond: number;
  baselinePerSecond: number;
  ratio: number;
  /** The same medians per second of process CPU time (see Rate.cpu). */
  cpuChecksPerSecond: number;
  cpuBaselinePerSecond: number;
}

export async function runEngineBench(options: { runs?: number; msPerRun?: number; log?: boolean } = {}): Promise<EngineBenchResult> {
  const { runs = 5, msPerRun = 600, log = false } = options;
  const { document, baseline } = buildBenchRuleset();
  const compiled = compileRuleset(document);
  const spec = buildBenchSpecification();
  const report = await evaluateSpecification(compiled, 'bench', spec);
  // Sanity: the two implementations agree on every finding's verdict.
  const base = baselineCheck(baseline, spec);
  const engineVerdicts = report.findings.filter((f) => f.verdict !== 'not_applicable').map((f) => `${f.requirementId}:${f.verdict}`).sort();
  const baseVerdicts = base.map((b) => `${b.id}:${b.verdict === 'unknown' ? 'needs_information' : b.verdict ? 'pass' : 'fail'}`).sort();
  if (JSON.stringify(engineVerdicts) !== JSON.stringify(baseVerdicts)) throw new Error('engine and baseline disagree on the bench specification');
  if (log) console.log(`ruleset: ${document.requirements.length} requirements; specification: ${spec.members.length} members; findings per check: ${report.findings.length}`);
  await perSecond(() => evaluateSpecification(compiled, 'bench', spec), 300); // warm-up
  await perSecond(() => baselineCheck(baseline, spec), 300);
  const engine: Rate[] = [];
  const plain: Rate[] = [];
  for (let i = 0; i < runs; i++) {
    engine.push(await perSecond(() => evaluateSpecification(compiled, 'bench', spec), msPerRun));
    plain.push(await perSecond(() => baselineCheck(baseline, spec), msPerRun));
  }
  const checksPerSecond = median(engine.map((r) => r.wall));
  const baselinePerSecond = median(plain.map((r) => r.wall));
  if (log) {
    const show = (rs: Rate[]) => rs.map((x) => `${x.wall.toFixed(0)} (cpu ${x.cpu.toFixed(0)})`).join(', ');
    console.log(`engine   runs: ${show(engine)} checks/s`);
    console.log(`baseline runs: ${show(plain)} checks/s`);
  }
  return {
    checksPerSecond, baselinePerSecond, ratio: baselinePerSecond / checksPerSecond,
    cpuChecksPerSecond: median(engine.map((r) => r.cpu)), cpuBaselinePerSecond: median(plain.map((r) => r.cpu)),
  };
}

const isMain = process.argv[1] !== undefined && import.meta.url === new URL(`file://${process.argv[1]}`).href;
if (isMain) {
  const r = await runEngineBench({ log: true });
  console.log(`engine (evaluateSpecification): ${r.checksPerSecond.toFixed(0)} checks/s (median), ${(1000 / r.checksPerSecond).toFixed(2)} ms per check`);
  console.log(`baseline (plain functions):     ${r.baselinePerSecond.toFixed(0)} checks/s (median)`);
  console.log(`ratio baseline/engine:          ${r.ratio.toFixed(1)}×`);
  console.log(`per CPU second: engine ${r.cpuChecksPerSecond.toFixed(0)} checks/s, baseline ${r.cpuBaselinePerSecond.toFixed(0)} checks/s (load average ${(await import('node:os')).loadavg()[0].toFixed(1)} on ${(await import('node:os')).cpus().length} cores)`);
  if (r.checksPerSecond < MIN_CHECKS_PER_SECOND) {
    console.error(`FAIL: below ${MIN_CHECKS_PER_SECOND} checks/s`);
    process.exit(1);
  }
}
