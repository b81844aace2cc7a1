// `npm run bench`: the engine bench (tests/bench/engine.ts, checks per second of the pure engine),
// the cage drawing after an edit (tests/bench/drawing.ts), the browser's frame after a node is moved
// (tests/bench/frame.ts), first-load JavaScript per route from the built front end
// (tests/bench/bundle.ts), the API bench (tests/bench/api.ts, latency, throughput and
// responsiveness through HTTP), and the re-check of 10,000 sheets through the worker pool and on one
// thread, with /api/health probed meanwhile (tests/bench/republish.ts), and one sheet against five
// rulebooks side by side against one check (tests/bench/side-by-side.ts).
// Prints one summary and exits non-zero when any target is missed. Numbers depend on the machine
// and on what else runs on it: see docs/decisions/0005-checks-in-worker-threads.md.
import { runApiBench, TARGETS } from './api';

interface Line {
  name: string;
  value: string;
  target: string;
  ok: boolean;
}

const lines: Line[] = [];
let failed = false;

try {
  const { runEngineBench, MIN_CHECKS_PER_SECOND } = await import('./engine');
  const engine = await runEngineBench({ log: true });
  lines.push({ name: 'engine checks/s (40 requirements, 15 members)', value: engine.checksPerSecond.toFixed(0), target: `≥ ${MIN_CHECKS_PER_SECOND}`, ok: engine.checksPerSecond >= MIN_CHECKS_PER_SECOND });
  lines.push({ name: 'engine vs plain functions', value: `${engine.ratio.toFixed(1)}× slower`, target: 'reported', ok: true });
} catch (err) {
  console.error('engine bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runGeometryBench, GEOMETRY_TARGET_MS } = await import('./geometry');
  const g = await runGeometryBench({ log: true });
  lines.push({ name: `cage geometry, every derived value (${g.members} members), 10th percentile`, value: `${g.deriveMs.toFixed(3)} ms, median ${g.deriveMedianMs.toFixed(3)} ms (bare loop over the same paths ${(g.bareMs * 1000).toFixed(2)} µs, ${g.ratio.toFixed(0)}×)`, target: `≤ ${GEOMETRY_TARGET_MS} ms`, ok: g.deriveMs <= GEOMETRY_TARGET_MS });
} catch (err) {
  console.error('geometry bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runDrawingBench, MAX_DRAW_MS } = await import('./drawing');
  const d = runDrawingBench();
  lines.push({ name: `cage drawing after one edit (${d.members} members: derive, project, three SVG views)`, value: `${d.drawMs.toFixed(2)} ms, ${d.ratio.toFixed(0)}× a bare loop over the nodes (${(d.baselineMs * 1000).toFixed(2)} µs)`, target: `≤ ${MAX_DRAW_MS} ms`, ok: d.drawMs <= MAX_DRAW_MS });
} catch (err) {
  console.error('drawing bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runFrameBench, MAX_FRAME_MS } = await import('./frame');
  const f = await runFrameBench({ log: true });
  lines.push({
    name: `the browser's frame after a node is moved (${f.members} tubes drawn; input event to layout done), median`,
    value: `${f.editMs.toFixed(1)} ms (script ${f.scriptMs.toFixed(1)} ms), ${f.ratio.toFixed(0)}× an input that changes nothing (${f.baselineMs.toFixed(2)} ms); next frame at ${f.toNextFrameMs.toFixed(1)} ms`,
    target: `≤ ${MAX_FRAME_MS} ms`,
    ok: f.editMs <= MAX_FRAME_MS,
  });
} catch (err) {
  console.error('frame bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { routeBundles, MAX_ROUTE_GZIP_KB } = await import('./bundle');
  for (const b of routeBundles()) {
    const lazy = b.lazy.length ? ` (lazy aside: ${b.lazy.map((l) => `${l.file.replace(/^assets\//, '')} ${l.gzipKb.toFixed(0)} kB`).join(', ')})` : '';
    lines.push({ name: `first-load JavaScript of the ${b.route}, gzipped`, value: `${b.gzipKb.toFixed(1)} kB${lazy}`, target: `≤ ${MAX_ROUTE_GZIP_KB} kB`, ok: b.gzipKb <= MAX_ROUTE_GZIP_KB });
  }
} catch (err) {
  console.error('bundle size check failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const api = await runApiBench({ log: true });
  lines.push({ name: 'dry run through the API, one client, p99', value: `${api.dryRun.p99Ms} ms (p50 ${api.dryRun.p50Ms} ms)`, target: `< ${TARGETS.dryRunP99Ms} ms`, ok: api.dryRun.p99Ms < TARGETS.dryRunP99Ms });
  lines.push({ name: `checks/s through the API, ${api.load.connections} clients`, value: api.load.checksPerSecond.toFixed(0), target: 'reported', ok: api.load.non2xx === 0 && api.load.errors === 0 });
  lines.push({ name: 'GET /api/health under that load, p99', value: `${api.health.p99Ms} ms (p50 ${api.health.p50Ms} ms)`, target: `< ${TARGETS.healthP99Ms} ms`, ok: api.health.p99Ms < TARGETS.healthP99Ms });
  lines.push({ name: 'server event-loop delay under load, p99', value: `${api.serverEventLoopDelay.p99Ms.toFixed(1)} ms`, target: 'reported', ok: true });
} catch (err) {
  console.error('API bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runPdfBench } = await import('./pdf');
  const pdf = await runPdfBench();
  lines.push({ name: 'PDF report (8 pages, 54 findings, 6 photos), median', value: `${pdf.medianMs} ms`, target: '< 150 ms', ok: pdf.medianMs < 150 });
} catch (err) {
  console.error('PDF bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runTubeChoiceBench, TUBE_CHOICE_TARGET_MS } = await import('./tube-choice');
  const t = await runTubeChoiceBench({ log: true });
  lines.push({ name: `tube chooser, one member (${t.stockSizes} stock sizes, ${t.requirements} requirements), median`, value: `${t.memberMs.toFixed(2)} ms (one full engine check: ${t.engineCheckMs.toFixed(2)} ms, ${(t.memberMs / t.engineCheckMs).toFixed(2)}×)`, target: `≤ ${TUBE_CHOICE_TARGET_MS} ms`, ok: t.memberMs <= TUBE_CHOICE_TARGET_MS });
  lines.push({ name: `tube chooser, whole sheet (${t.members} members), median`, value: `${t.sheetMs.toFixed(1)} ms, ${(t.sheetMs / t.engineCheckMs).toFixed(2)}× one engine check (an engine run per size would take ${(t.enginePerSizeMs * t.stockSizes).toFixed(0)} ms for one member)`, target: 'reported', ok: true });
  lines.push({ name: 'tube chooser, whole sheet with the braces matched to the hoop (sizes tried on the sheet)', value: `${t.sheetMatchedMs.toFixed(1)} ms, ${(t.sheetMatchedMs / t.sheetMs).toFixed(1)}× the sheet without`, target: 'reported', ok: true });
} catch (err) {
  console.error('tube chooser bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runSideBySideBench, MAX_RATIO } = await import('./side-by-side');
  const s = await runSideBySideBench({ log: true });
  lines.push({
    name: `one sheet against ${s.rulebooks} rulebooks side by side (one compare job: parsed once, evaluated under each, compared; ${s.rows} rows), median`,
    value: `${s.fiveMs.toFixed(1)} ms, ${s.ratio.toFixed(2)}× one check (${s.oneCheckMs.toFixed(1)} ms, a fifth of checking the sheet against each of the ${s.rulebooks} in turn)`,
    target: `≤ ${MAX_RATIO}× one check`,
    ok: s.ratio <= MAX_RATIO,
  });
} catch (err) {
  console.error('side-by-side bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runCopePdfBench, COPE_PDF_TARGET_MS } = await import('./cope-pdf');
  const c = await runCopePdfBench({ log: true });
  lines.push({
    name: `cope template PDF (${c.pages} pages, fonts loaded), median`,
    value: `${c.medianMs.toFixed(0)} ms wall, ${c.cpuMs.toFixed(0)} ms CPU (${c.pages} plain text pages: ${c.baselineMs.toFixed(0)} ms, ${(c.medianMs / c.baselineMs).toFixed(1)}×)`,
    target: `≤ ${COPE_PDF_TARGET_MS} ms`,
    ok: c.pages >= 10 && c.medianMs <= COPE_PDF_TARGET_MS,
  });
} catch (err) {
  console.error('cope template bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

try {
  const { runRepublishBench, REPUBLISH_TARGET_SECONDS, MIN_POOL_SPEEDUP, HEALTH_P99_TARGET_MS } = await import('./republish');
  const r = await runRepublishBench({ log: true });
  const w = r.workers;
  const one = r.oneThread;
  lines.push({ name: `re-check after a publish (${r.sheets} sheets, database included), worker pool of ${w.threads} threads`, value: `${w.seconds.toFixed(1)} s, ${w.sheetsPerSecond.toFixed(0)} sheets/s`, target: `< ${REPUBLISH_TARGET_SECONDS} s`, ok: w.seconds < REPUBLISH_TARGET_SECONDS && w.sheets === r.sheets && w.failed === 0 });
  lines.push({ name: 'the same re-check on one thread', value: `${one.seconds.toFixed(1)} s, ${one.sheetsPerSecond.toFixed(0)} sheets/s`, target: 'reported', ok: one.sheets === r.sheets && one.failed === 0 });
  lines.push({ name: 're-check speed-up from the worker pool', value: `${r.speedup.toFixed(2)}× (the server got ${w.coresUsed.toFixed(2)} cores with the pool, ${one.coresUsed.toFixed(2)} on one thread)`, target: r.cores >= 2 ? `≥ ${MIN_POOL_SPEEDUP}× on ${r.cores} cores` : 'reported (1 core)', ok: r.cores < 2 || r.speedup >= MIN_POOL_SPEEDUP });
  if (w.mainThreadCpuSeconds !== null && one.mainThreadCpuSeconds !== null) {
    lines.push({ name: 'main thread CPU during the re-check (the thread that answers requests)', value: `${w.mainThreadCpuSeconds.toFixed(1)} s with the pool, ${one.mainThreadCpuSeconds.toFixed(1)} s on one thread (${(one.mainThreadCpuSeconds / Math.max(w.mainThreadCpuSeconds, 0.01)).toFixed(1)}× less)`, target: 'reported', ok: true });
  }
  lines.push({ name: 'GET /api/health during the worker-pool re-check, p99', value: `${w.health.p99Ms.toFixed(0)} ms (p50 ${w.health.p50Ms.toFixed(0)} ms; during the one-thread re-check p99 ${one.health.p99Ms.toFixed(0)} ms, ${(one.health.p99Ms / Math.max(w.health.p99Ms, 1)).toFixed(1)}× higher)`, target: `< ${HEALTH_P99_TARGET_MS} ms`, ok: w.health.p99Ms < HEALTH_P99_TARGET_MS && w.health.non200 === 0 });
} catch (err) {
  console.error('re-check bench failed:', err instanceof Error ? err.message : err);
  failed = true;
}

const cores = (await import('node:os')).availableParallelism();
const load = (await import('node:os')).loadavg()[0]!;
console.log(`\nBench summary (${cores} cores, load average ${load.toFixed(1)} at the end)`);
for (const l of lines) console.log(`  ${l.ok ? 'ok  ' : 'MISS'}  ${l.name}: ${l.value}  [target ${l.target}]`);
if (load > cores) console.log(`  note: the load average is above the core count; other work on this machine inflates these numbers.`);
const missed = lines.filter((l) => !l.ok).length;
if (failed || missed > 0) {
  console.log(`${missed} target(s) missed${failed ? ', and a bench did not complete' : ''}.`);
  process.exitCode = 1;
} else {
  console.log('All targets met.');
}
