// Where check evaluations run. Two engines with one interface:
//  - `workers` (the default): a pool of worker threads (node:worker_threads), so the server's event
//    loop stays free for other requests while checks compute. Each worker keeps its own compiled
//    rulesets; the first job for a key to a worker carries the document (messages to a worker leave
//    in order, so later jobs follow it). Jobs go to the least busy worker; the number of jobs in
//    flight may be bounded, beyond it a check is refused with 503 `checks_busy` rather than queued
//    without limit.
//  - `in-process`: evaluation on the calling thread, with the compiled-ruleset cache (tests and
//    tools that want no threads, and the one-thread baseline of the re-check).
// Three jobs: `evaluate` (a builder's check: the specification parsed, the full report as JSON text),
// `verdict` (bulk re-checks: a stored specification's verdict only, no report built on the wire) and
// `compare` (one sheet against several rulebooks: parsed once, evaluated under each, and only the
// side-by-side matrix crosses back; the reports are never serialised).
// The check service keeps two pools: interactive checks in one (cores − 1 workers, bounded), bulk
// re-checks in their own (one worker per core, started on demand and ended when idle), so a publish
// or impact re-check never makes a builder's check wait for a place (`checks_busy`).
// docs/decisions/0005-checks-in-worker-threads.md and 0013-bulk-re-checks-in-their-own-workers.md
// have the measurements behind the choices.
import { createRequire } from 'node:module';
import { availableParallelism } from 'node:os';
import { setImmediate as yieldToLoop } from 'node:timers/promises';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { DocumentProblem, RulesetDocument } from '../contracts/ruleset';
import type { Specification } from '../contracts/specification';
import type { Verdict } from '../contracts/rulebook-admin';
import { evaluateSpecification, UnknownClassError, type CompiledRuleset } from '../domain';
import { evaluateSideBySide, type SideBySideResult } from '../domain/compare/side-by-side';
import type { UnitSystem } from '../domain/units';
import { AppError, ConflictError, InternalError, NotFoundError, ValidationError } from '../errors';
import { parseCheckSpecification } from './check-input';
import { compiledCacheKey, type CacheKeyParts } from './compiled-ruleset-cache';

export interface CheckJob {
  /** The ruleset version; its cache key (compiledCacheKey) says when a compilation is still valid. */
  version: CacheKeyParts;
  classId: string;
  /** Untrusted; parsed by the engine with the shared schema (check-input.ts). */
  specification: unknown;
  unitSystem?: UnitSystem;
}

/** A stored specification's verdict under a version (bulk re-checks). */
export interface VerdictJob {
  version: CacheKeyParts;
  classId: string;
  /** The specification as stored, as JSON text: parsed where it is evaluated, not on the event loop. */
  specificationJson: string;
}

/** One specification against several rulebooks, side by side. */
export interface CompareJob {
  /** The sheet's own rulebook first: the specification names its class. */
  columns: readonly { version: CacheKeyParts; classId: string; home: boolean }[];
  /** Parsed by the engine with the shared schema, once for every column. */
  specification: unknown;
  unitSystem: UnitSystem;
}

export interface EvaluatedCheck {
  /** The specification as parsed (what a saved run stores). */
  specification: Specification;
  /** The CheckReport as JSON text. */
  reportJson: string;
}

export interface CheckEngineStats {
  mode: 'workers' | 'in-process';
  /** Compilations done (in worker mode: summed over the workers, at most one per worker and key). */
  compiles: number;
  workers: number;
  inFlight: number;
}

export interface CheckEngine {
  evaluate(job: CheckJob): Promise<EvaluatedCheck>;
  /** Rejects when the specification cannot be evaluated (the caller counts it as failed). */
  verdict(job: VerdictJob): Promise<Verdict>;
  compare(job: CompareJob): Promise<SideBySideResult>;
  stats(): CheckEngineStats;
  close(): Promise<void>;
}

export type CheckJobMessage =
  | (Omit<CheckJob, 'version'> & { type: 'report'; id: number; key: string; document?: RulesetDocument })
  | (Omit<VerdictJob, 'version'> & { type: 'verdict'; id: number; key: string; document?: RulesetDocument })
  | (Omit<CompareJob, 'columns'> & {
      type: 'compare';
      id: number;
      /** `key` is the compilation's, `column` the matrix's; a document rides with the first column that needs it. */
      columns: { key: string; column: string; classId: string; home: boolean; document?: RulesetDocument }[];
    });
export type CheckReplyMessage =
  | { id: number; ok: true; reportJson: string; specification: Specification; compiled: boolean }
  | { id: number; ok: true; verdict: Verdict; compiled: boolean }
  | { id: number; ok: true; result: SideBySideResult; compiled: number }
  | {
      id: number;
      ok: false;
      kind: 'need-document' | 'invalid-ruleset' | 'invalid-specification' | 'unknown-class' | 'error';
      message: string;
      problems?: DocumentProblem[];
    };

export class ChecksBusyError extends AppError {
  constructor() {
    super(503, 'checks_busy', 'Too many checks are running right now. Try again in a moment.');
  }
}

/**
 * The engine was closed, or the worker thread holding the job died: nothing is known about the
 * specification. A check answers 500 as before; a bulk re-check stops its attempt (to be retried)
 * instead of counting the sheet as one that cannot be evaluated.
 */
export class CheckEngineUnavailableError extends InternalError {
  override name = 'CheckEngineUnavailableError';
}

/** The side-by-side column key: one rulebook version in one class. */
export function compareColumnKey(versionId: string, classId: string): string {
  return `${versionId}:${classId}`;
}

/** The first column's class is the one the specification must name. */
export function parseCompareSpecification(job: { columns: readonly { classId: string }[]; specification: unknown }) {
  const first = job.columns[0];
  if (!first) return { ok: false as const, problems: [{ path: 'columns', message: 'At least one rulebook to compare with' }] };
  return parseCheckSpecification(job.specification, first.classId);
}

function invalidRuleset(problems: DocumentProblem[]): ConflictError {
  return new ConflictError('This ruleset version cannot be used for checks: its document has problems an admin must fix.', { problems });
}

/**
 * Evaluation on the calling thread; `compile` is the rulesets service's cached loadCompiled. Verdict
 * jobs run one at a time and give the event loop back every few, so a re-check on this engine (the
 * one-thread baseline) still lets requests through between evaluations.
 */
export function createInProcessEngine(compile: (version: CacheKeyParts) => Promise<CompiledRuleset>, counter: () => number, options: { yieldEvery?: number } = {}): CheckEngine {
  const yieldEvery = options.yieldEvery ?? 20;
  let queue: Promise<unknown> = Promise.resolve();
  let sinceYield = 0;
  let inFlight = 0;
  async function verdictNow(job: VerdictJob): Promise<Verdict> {
    if (++sinceYield >= yieldEvery) {
      sinceYield = 0;
      await yieldToLoop();
    }
    const compiled = await compile(job.version);
    return (await evaluateSpecification(compiled, job.classId, JSON.parse(job.specificationJson) as Specification)).verdict;
  }
  return {
    async evaluate(job) {
      const parsed = parseCheckSpecification(job.specification, job.classId);
      if (!parsed.ok) throw new ValidationError(parsed.problems);
      const compiled = await compile(job.version);
      try {
        const report = await evaluateSpecification(compiled, job.classId, parsed.specification, job.unitSystem ? { unitSystem: job.unitSystem } : {});
        return { specification: parsed.specification, reportJson: JSON.stringify(report) };
      } catch (err) {
        if (err instanceof UnknownClassError) throw new NotFoundError(err.message);
        throw err;
      }
    },
    verdict(job) {
      inFlight++;
      const run = queue.then(() => verdictNow(job));
      queue = run.catch(() => undefined);
      return run.finally(() => inFlight--);
    },
    async compare(job) {
      const parsed = parseCompareSpecification(job);
      if (!parsed.ok) throw new ValidationError(parsed.problems);
      const rulebooks = [];
      for (const c of job.columns) rulebooks.push({ key: compareColumnKey(c.version.id, c.classId), home: c.home, classId: c.classId, compiled: await compile(c.version) });
      try {
        return await evaluateSideBySide(parsed.specification, rulebooks, job.unitSystem);
      } catch (err) {
        if (err instanceof UnknownClassError) throw new NotFoundError(err.message);
        throw err;
      }
    },
    stats: () => ({ mode: 'in-process', compiles: counter(), workers: 0, inFlight }),
    close: async () => undefined,
  };
}

export interface WorkerEngineOptions {
  /** Worker threads; default: one fewer than the machine's cores, at least one. */
  size?: number;
  /** Jobs in flight across all workers before new checks are refused (503); Infinity: never. */
  maxInFlight?: number;
  /** End the workers after this long without a job (they start again on the next); default: never. */
  idleMs?: number;
  /**
   * A nice value for the worker threads (Linux; elsewhere ignored): bulk re-checks run at a lower
   * priority than the main thread and the interactive workers, so they take the cores those leave idle.
   */
  niceness?: number;
  /** The version's document (read from the database by the rulesets service). */
  documentFor: (version: CacheKeyParts) => Promise<RulesetDocument>;
}

/** The compilations a job needs: one, or one per column of a comparison. */
interface Need {
  key: string;
  version: CacheKeyParts;
}

type Pending = { needs: Need[]; reject: (err: unknown) => void; retried: boolean } & (
  | { type: 'report'; job: CheckJob; resolve: (result: EvaluatedCheck) => void }
  | { type: 'verdict'; job: VerdictJob; resolve: (result: Verdict) => void }
  | { type: 'compare'; job: CompareJob; resolve: (result: SideBySideResult) => void }
);

interface PoolWorker {
  worker: Worker;
  /** Keys whose document this worker has been sent (it compiles on receipt, in message order). */
  sent: Set<string>;
  pending: Map<number, Pending>;
  /** Messages leave one after another: a job never overtakes the document it needs. */
  chain: Promise<void>;
}

// The worker is TypeScript; tsx (a dependency) compiles it in the thread, whichever way the
// server itself was started (tsx, node --import tsx, vitest).
const tsxApi = pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href.replace(/index\.cjs$/, 'index.mjs');
const workerFile = new URL('./check-worker.ts', import.meta.url).href;
const bootstrap = `import(${JSON.stringify(tsxApi)}).then(({ tsImport }) => tsImport(${JSON.stringify(workerFile)}, ${JSON.stringify(workerFile)}))`;

function needOf(version: CacheKeyParts): Need {
  return { key: compiledCacheKey(version), version };
}

export function createWorkerEngine(options: WorkerEngineOptions): CheckEngine {
  const size = Math.max(1, options.size ?? availableParallelism() - 1);
  const maxInFlight = options.maxInFlight ?? 200;
  const workers: PoolWorker[] = [];
  let nextId = 1;
  let compiles = 0;
  let inFlight = 0;
  let closed = false;
  let idleTimer: NodeJS.Timeout | null = null;

  function spawn(): PoolWorker {
    const worker = new Worker(bootstrap, { eval: true, execArgv: [], workerData: { niceness: options.niceness ?? 0 } });
    // Idle workers must not keep the process alive; close() ends them explicitly.
    worker.unref();
    const pw: PoolWorker = { worker, sent: new Set(), pending: new Map(), chain: Promise.resolve() };
    worker.on('message', (reply: CheckReplyMessage) => onReply(pw, reply));
    const fail = (err: unknown) => {
      const i = workers.indexOf(pw);
      if (i >= 0) workers.splice(i, 1);
      for (const p of pw.pending.values()) {
        inFlight--;
        p.reject(err instanceof AppError ? err : new CheckEngineUnavailableError());
      }
      pw.pending.clear();
    };
    worker.on('error', fail);
    worker.on('exit', () => fail(new CheckEngineUnavailableError()));
    return pw;
  }

  function pick(): PoolWorker {
    if (idleTimer) {
      clearTimeout(idleTimer);
      idleTimer = null;
    }
    while (workers.length < size) workers.push(spawn());
    return workers.reduce((a, b) => (b.pending.size < a.pending.size ? b : a));
  }

  /** With `idleMs`, the workers end once nothing has been asked of them for that long. */
  function settle(): void {
    if (options.idleMs === undefined || inFlight > 0 || closed || idleTimer) return;
    idleTimer = setTimeout(() => {
      idleTimer = null;
      if (inFlight === 0) void Promise.all(workers.splice(0).map((w) => w.worker.terminate()));
    }, options.idleMs);
    idleTimer.unref();
  }

  function send(pw: PoolWorker, id: number, p: Pending): void {
    pw.chain = pw.chain.then(async () => {
      const documents = new Map<string, RulesetDocument>();
      try {
        for (const need of p.needs) if (!pw.sent.has(need.key) && !documents.has(need.key)) documents.set(need.key, await options.documentFor(need.version));
      } catch (err) {
        pw.pending.delete(id);
        inFlight--;
        p.reject(err);
        settle();
        return;
      }
      for (const key of documents.keys()) pw.sent.add(key);
      /** The document for this key, once per message: later columns with the same key go without. */
      const take = (key: string) => {
        const document = documents.get(key);
        documents.delete(key);
        return document ? { document } : {};
      };
      let msg: CheckJobMessage;
      if (p.type === 'compare') {
        const columns = p.job.columns.map((c, i) => ({ key: p.needs[i]!.key, column: compareColumnKey(c.version.id, c.classId), classId: c.classId, home: c.home, ...take(p.needs[i]!.key) }));
        msg = { type: 'compare', id, columns, specification: p.job.specification, unitSystem: p.job.unitSystem };
      } else {
        const key = p.needs[0]!.key;
        const extra = { id, key, ...take(key) };
        if (p.type === 'report') {
          const { version: _version, ...rest } = p.job;
          msg = { type: 'report', ...rest, ...extra };
        } else {
          const { version: _version, ...rest } = p.job;
          msg = { type: 'verdict', ...rest, ...extra };
        }
      }
      try {
        pw.worker.postMessage(msg);
      } catch (err) {
        pw.pending.delete(id);
        inFlight--;
        p.reject(err);
        settle();
      }
    });
  }

  function onReply(pw: PoolWorker, reply: CheckReplyMessage): void {
    const p = pw.pending.get(reply.id);
    if (!p) return;
    if (!reply.ok && reply.kind === 'need-document' && !p.retried) {
      // The worker let a compilation go (its cache is bounded): send the documents again.
      for (const need of p.needs) pw.sent.delete(need.key);
      p.retried = true;
      send(pw, reply.id, p);
      return;
    }
    pw.pending.delete(reply.id);
    inFlight--;
    settle();
    if (reply.ok) {
      compiles += Number(reply.compiled);
      if ('verdict' in reply) {
        if (p.type === 'verdict') p.resolve(reply.verdict);
        else p.reject(new InternalError());
      } else if ('result' in reply) {
        if (p.type === 'compare') p.resolve(reply.result);
        else p.reject(new InternalError());
      } else if (p.type === 'report') p.resolve({ specification: reply.specification, reportJson: reply.reportJson });
      else p.reject(new InternalError());
      return;
    }
    if (reply.kind === 'invalid-ruleset') for (const need of p.needs) pw.sent.delete(need.key);
    if (reply.kind === 'unknown-class') p.reject(new NotFoundError(reply.message));
    else if (reply.kind === 'invalid-ruleset') p.reject(invalidRuleset(reply.problems ?? []));
    else if (reply.kind === 'invalid-specification') p.reject(new ValidationError(reply.problems ?? []));
    else p.reject(new InternalError());
  }

  function submit<T>(make: (resolve: (v: T) => void, reject: (err: unknown) => void) => Pending): Promise<T> {
    if (closed) return Promise.reject(new CheckEngineUnavailableError());
    if (inFlight >= maxInFlight) return Promise.reject(new ChecksBusyError());
    return new Promise<T>((resolve, reject) => {
      const pw = pick();
      const id = nextId++;
      const p = make(resolve, reject);
      pw.pending.set(id, p);
      inFlight++;
      send(pw, id, p);
    });
  }

  return {
    evaluate(job) {
      return submit<EvaluatedCheck>((resolve, reject) => ({ type: 'report', job, needs: [needOf(job.version)], resolve, reject, retried: false }));
    },
    verdict(job) {
      return submit<Verdict>((resolve, reject) => ({ type: 'verdict', job, needs: [needOf(job.version)], resolve, reject, retried: false }));
    },
    compare(job) {
      if (job.columns.length === 0) return Promise.reject(new ValidationError([{ path: 'columns', message: 'At least one rulebook to compare with' }]));
      return submit<SideBySideResult>((resolve, reject) => ({ type: 'compare', job, needs: job.columns.map((c) => needOf(c.version)), resolve, reject, retried: false }));
    },
    stats: () => ({ mode: 'workers', compiles, workers: workers.length, inFlight }),
    async close() {
      closed = true;
      if (idleTimer) clearTimeout(idleTimer);
      await Promise.all(workers.splice(0).map((w) => w.worker.terminate()));
    },
  };
}
