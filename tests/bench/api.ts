// API bench: checks through the real HTTP stack (session from PostgreSQL, CSRF, zod, service,
// engine) against a server on loopback, in a child process of its own so the load generator does
// not share its event loop. Measures
//  1. one client posting dry-run checks one after another: latency (target p99 < 50 ms);
//  2. 50 clients posting checks for 10 s while a probe asks GET /api/health 20 times a second:
//     checks/s and the health probe's p50/p99 (target p99 < 100 ms), plus the server's own
//     event-loop delay.
// The bench database `cagewright_bench` lives in the test cluster (scripts/pg.sh start --test) and
// is created afresh, migrated and seeded each run. The ruleset is the 40-requirement bench ruleset
// and the 15-member bench specification of tests/bench/fixtures.ts.
//   npx tsx --tsconfig tsconfig.json tests/bench/api.ts
import { fork, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import type { AddressInfo } from 'node:net';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import autocannon from 'autocannon';
import { freshSeededDatabase } from './bench-db';

const root = fileURLToPath(new URL('../..', import.meta.url));
const benchDb = 'cagewright_bench';

export const TARGETS = { dryRunP99Ms: 50, healthP99Ms: 100 } as const;

export interface ApiBenchResult {
  dryRun: { p50Ms: number; p99Ms: number; meanMs: number; requests: number };
  load: { connections: number; seconds: number; checksPerSecond: number; checkP50Ms: number; checkP99Ms: number; non2xx: number; errors: number };
  health: { p50Ms: number; p99Ms: number; maxMs: number; requests: number; non2xx: number };
  serverEventLoopDelay: { p50Ms: number; p99Ms: number; maxMs: number };
  pass: boolean;
  misses: string[];
}

/** A fresh, migrated, seeded bench database with the bench rulebook published; its URL and version id. */
async function prepareDatabase(): Promise<{ url: string; versionId: string }> {
  const { validateRulesetDocument } = await import('../../backend/src/domain');
  const { buildBenchRuleset } = await import('./fixtures');
  const { url, ds } = await freshSeededDatabase(benchDb, 2);
  try {
    const validation = validateRulesetDocument(buildBenchRuleset().document);
    if (!validation.ok) throw new Error(`bench ruleset invalid: ${JSON.stringify(validation.problems.slice(0, 3))}`);
    const doc = validation.document;
    const [book] = await ds.query(
      `INSERT INTO rulebooks (club_id, slug, title, publisher) SELECT id, 'bench', $1, $2 FROM clubs WHERE slug = 'tarnwick-vale' RETURNING id`,
      [doc.rulebook.title, doc.rulebook.publisher],
    );
    const [version] = await ds.query(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document, published_at)
       VALUES ($1, 1, 'published', $2, $3, $4, now()) RETURNING id`,
      [book.id, doc.rulebook.edition, doc.rulebook.effectiveDate, JSON.stringify(doc)],
    );
    return { url, versionId: version.id as string };
  } finally {
    await ds.destroy();
  }
}

/** Child process: the app on an ephemeral loopback port, reporting its event-loop delay on request. */
async function serve(databaseUrl: string): Promise<void> {
  const { createApp, closeApp } = await import('../../backend/src/app');
  const { loadConfig } = await import('../../backend/src/config');
  const { createDataSource } = await import('../../backend/src/db/data-source');
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: databaseUrl, PUBLIC_URL: 'http://127.0.0.1', LOG_LEVEL: 'warn' });
  const ds = createDataSource({ databaseUrl, poolSize: 10 });
  await ds.initialize();
  // BENCH_ENGINE=in-process runs the checks on the server's own thread, for comparison.
  const { createServices } = await import('../../backend/src/services');
  const { createCheckService } = await import('../../backend/src/services/checks.service');
  const base = createServices(ds, { publicUrl: config.publicUrl });
  const engine = process.env.BENCH_ENGINE === 'in-process' ? 'in-process' : 'workers';
  const services = { ...base, checks: createCheckService(ds, base.rulesets, { engine }) };
  const app = createApp({ dataSource: ds, config, services, frontendDist: null, pruneSessions: false });
  const server = app.listen(0, '127.0.0.1');
  await once(server, 'listening');
  let active = 0;
  server.on('request', (_req, res: import('node:http').ServerResponse) => {
    active++;
    res.on('close', () => active--);
  });
  const delay = monitorEventLoopDelay({ resolution: 5 });
  process.on('message', (msg: { type: string }) => {
    if (msg.type === 'delay-start') {
      delay.reset();
      delay.enable();
    } else if (msg.type === 'delay-stop') {
      delay.disable();
      const ms = (ns: number) => ns / 1e6;
      process.send!({ type: 'delay', p50Ms: ms(delay.percentile(50)), p99Ms: ms(delay.percentile(99)), maxMs: ms(delay.max) });
    }
  });
  process.on('disconnect', () => {
    // Let requests still being answered finish (the load generator has hung up) before the pool goes.
    const closed = new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeIdleConnections();
    const grace = new Promise<void>((resolve) => setTimeout(resolve, 10_000).unref());
    const drained = (async () => {
      await closed;
      // Handlers of requests whose client already hung up may still be running.
      for (let i = 0; i < 100 && (active > 0 || services.checks.engineStats().inFlight > 0); i++) await new Promise((r) => setTimeout(r, 100));
      await new Promise((r) => setTimeout(r, 200));
    })();
    void Promise.race([drained, grace])
      .then(() => services.checks.close())
      .then(() => closeApp(app))
      .then(() => ds.destroy())
      .finally(() => process.exit(0));
  });
  process.send!({ type: 'ready', port: (server.address() as AddressInfo).port, workers: engine === 'workers' ? 1 : 0 });
}

function request(child: ChildProcess, type: string, answer: string): Promise<Record<string, number>> {
  return new Promise((resolve) => {
    const onMessage = (msg: { type: string } & Record<string, number>) => {
      if (msg.type !== answer) return;
      child.off('message', onMessage);
      resolve(msg);
    };
    child.on('message', onMessage);
    child.send({ type });
  });
}

/** Signs the demo builder in; the session cookie and CSRF token every bench request carries. */
async function signIn(base: string): Promise<{ cookie: string; token: string }> {
  const { demoPassword } = await import('../../backend/src/db/seed-data');
  // Signing in uses the anonymous CSRF cookie (cw.csrf); after it, the session cookie (cw.sid) alone.
  const first = await fetch(`${base}/api/auth/csrf`);
  let cookie = (first.headers.getSetCookie()[0] ?? '').split(';')[0]!;
  const { token } = (await first.json()) as { token: string };
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': token },
    body: JSON.stringify({ email: 'builder@tarnwick.example', password: demoPassword }),
  });
  if (login.status !== 200) throw new Error(`bench sign-in failed: ${login.status}`);
  cookie = (login.headers.getSetCookie().find((c) => c.startsWith('cw.sid=')) ?? '').split(';')[0]!;
  const fresh = (await (await fetch(`${base}/api/auth/csrf`, { headers: { cookie } })).json()) as { token: string };
  return { cookie, token: fresh.token };
}

function cannon(opts: autocannon.Options): Promise<autocannon.Result> {
  return new Promise((resolve, reject) => {
    autocannon(opts, (err, result) => (err ? reject(err) : resolve(result)));
  });
}

export async function runApiBench(options: { log?: boolean; seconds?: number; connections?: number } = {}): Promise<ApiBenchResult> {
  const { log = false, seconds = 10, connections = 50 } = options;
  const say = (line: string) => log && console.log(line);
  const { url, versionId } = await prepareDatabase();
  const child = fork(fileURLToPath(import.meta.url), ['--serve', url], {
    env: { ...process.env, TSX_TSCONFIG_PATH: `${root}tsconfig.json` },
    // BENCH_CPU_PROF=<folder> writes a CPU profile of the server's main thread there.
    execArgv: [...process.execArgv, ...(process.env.BENCH_CPU_PROF ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_CPU_PROF}`] : [])],
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  try {
    const ready = await Promise.race([
      request(child, 'noop', 'ready'),
      once(child, 'exit').then(() => {
        throw new Error('bench server exited before it was ready');
      }),
    ]);
    const base = `http://127.0.0.1:${ready.port}`;
    const { cookie, token } = await signIn(base);
    const { buildBenchSpecification } = await import('./fixtures');
    const body = JSON.stringify({ rulesetVersionId: versionId, classId: 'bench', specification: buildBenchSpecification() });
    const headers = { 'content-type': 'application/json', cookie, 'x-csrf-token': token };

    // The first check compiles and caches the ruleset; it must already be a real report.
    const first = await fetch(`${base}/api/checks`, { method: 'POST', headers, body });
    const firstBody = (await first.json()) as { report?: { findings: unknown[]; verdict: string } };
    if (first.status !== 200 || !firstBody.report) throw new Error(`bench check failed: ${first.status} ${JSON.stringify(firstBody).slice(0, 300)}`);
    say(`api bench: ${firstBody.report.findings.length} findings per check (verdict ${firstBody.report.verdict}, ${body.length} B request, ${JSON.stringify(firstBody).length} B response), checks ${ready.workers ? 'in worker threads' : 'in process'}, ${base}`);

    const checkRequest = { method: 'POST' as const, path: '/api/checks', headers, body };
    await cannon({ url: base, connections: 4, duration: 2, requests: [checkRequest] }); // warm-up
    const single = await cannon({ url: base, connections: 1, duration: 5, requests: [checkRequest] });
    say(`dry run, one client: p50 ${single.latency.p50} ms, p99 ${single.latency.p99} ms, mean ${single.latency.average} ms over ${single.requests.total} checks`);

    child.send({ type: 'delay-start' });
    const [load, health] = await Promise.all([
      // The load runs in a worker thread of its own: parsing 50 clients' 100 kB reports on this
      // thread would delay the probe's own timing and be counted as server latency.
      cannon({ url: base, connections, duration: seconds, requests: [checkRequest], workers: 1 }),
      // One probe connection at 20 requests/s: it measures waiting, it does not add load.
      cannon({ url: base, connections: 1, duration: seconds, overallRate: 20, requests: [{ method: 'GET', path: '/api/health' }] }),
    ]);
    const delay = await request(child, 'delay-stop', 'delay');
    const checksPerSecond = load['2xx'] / seconds;
    say(`${connections} clients for ${seconds} s: ${checksPerSecond.toFixed(0)} checks/s, check p50 ${load.latency.p50} ms p99 ${load.latency.p99} ms, non-2xx ${load.non2xx}, errors ${load.errors}`);
    say(`health under load: p50 ${health.latency.p50} ms, p99 ${health.latency.p99} ms, max ${health.latency.max} ms over ${health.requests.total} probes`);
    say(`server event-loop delay under load: p50 ${delay.p50Ms!.toFixed(1)} ms, p99 ${delay.p99Ms!.toFixed(1)} ms, max ${delay.maxMs!.toFixed(1)} ms`);

    const misses: string[] = [];
    if (single.latency.p99 >= TARGETS.dryRunP99Ms) misses.push(`dry-run p99 ${single.latency.p99} ms ≥ ${TARGETS.dryRunP99Ms} ms`);
    if (health.latency.p99 >= TARGETS.healthP99Ms) misses.push(`health p99 under load ${health.latency.p99} ms ≥ ${TARGETS.healthP99Ms} ms`);
    if (single.non2xx + load.non2xx + health.non2xx > 0 || load.errors + health.errors > 0) misses.push('some requests failed (non-2xx or socket errors)');
    return {
      dryRun: { p50Ms: single.latency.p50, p99Ms: single.latency.p99, meanMs: single.latency.average, requests: single.requests.total },
      load: { connections, seconds, checksPerSecond, checkP50Ms: load.latency.p50, checkP99Ms: load.latency.p99, non2xx: load.non2xx, errors: load.errors },
      health: { p50Ms: health.latency.p50, p99Ms: health.latency.p99, maxMs: health.latency.max, requests: health.requests.total, non2xx: health.non2xx },
      serverEventLoopDelay: { p50Ms: delay.p50Ms!, p99Ms: delay.p99Ms!, maxMs: delay.maxMs! },
      pass: misses.length === 0,
      misses,
    };
  } finally {
    child.disconnect();
    await Promise.race([once(child, 'exit'), new Promise((r) => setTimeout(r, 5000))]);
    if (child.exitCode === null) child.kill('SIGKILL');
  }
}

const entry = process.argv[1] ? fileURLToPath(import.meta.url) === process.argv[1] : false;
if (entry && process.argv[2] === '--serve') {
  await serve(process.argv[3]!);
} else if (entry) {
  const result = await runApiBench({ log: true });
  if (!result.pass) {
    console.error(`FAIL: ${result.misses.join('; ')}`);
    process.exitCode = 1;
  }
}
