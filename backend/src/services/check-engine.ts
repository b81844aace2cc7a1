// Where check evaluations run. Two engines with one interface:
//  - `workers` (the default): a small pool of worker threads (node:worker_threads), so the
//    server's event loop stays free for other requests while checks compute. Each worker keeps
//    its own compiled rulesets; the first job for a key to a worker carries the document. Jobs go
//    to the least busy worker; the number of jobs in flight is bounded, beyond it a check is
//    refused with 503 `checks_busy` rather than queued without limit.
//  - `in-process`: evaluation on the calling thread, with the compiled-ruleset cache (tests and
//    tools that want no threads).
// docs/decisions/0005-checks-in-worker-threads.md has the measurements behind the choice.
import { createRequire } from 'node:module';
import { availableParallelism } from 'node:os';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { DocumentProblem, RulesetDocument } from '../contracts/ruleset';
import type { Specification } from '../contracts/specification';
import { evaluateSpecification, UnknownClassError, type CompiledRuleset } from '../domain';
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
  stats(): CheckEngineStats;
  close(): Promise<void>;
}

export type CheckJobMessage = Omit<CheckJob, 'version'> & { id: number; key: string; document?: RulesetDocument };
export type CheckReplyMessage =
  | { id: number; ok: true; reportJson: string; specification: Specification; compiled: boolean }
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

function invalidRuleset(problems: DocumentProblem[]): ConflictError {
  return new ConflictError('This ruleset version cannot be used for checks: its document has problems an admin must fix.', { problems });
}

/** Evaluation on the calling thread; `compile` is the rulesets service's cached loadCompiled. */
export function createInProcessEngine(compile: (version: CacheKeyParts) => Promise<CompiledRuleset>, counter: () => number): CheckEngine {
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
    stats: () => ({ mode: 'in-process', compiles: counter(), workers: 0, inFlight: 0 }),
    close: async () => undefined,
  };
}

export interface WorkerEngineOptions {
  /** Worker threads; default: one fewer than the machine's cores, at least one. */
  size?: number;
  /** Jobs in flight across all workers before new checks are refused (503). */
  maxInFlight?: number;
  /** The version's document (read from the database by the rulesets service). */
  documentFor: (version: CacheKeyParts) => Promise<RulesetDocument>;
}

interface Pending {
  job: CheckJob;
  key: string;
  resolve: (result: EvaluatedCheck) => void;
  reject: (err: unknown) => void;
  retried: boolean;
}

interface PoolWorker {
  worker: Worker;
  /** Keys whose document this worker has been sent (it compiles on receipt, in message order). */
  sent: Set<string>;
  pending: Map<number, Pending>;
}

// The worker is TypeScript; tsx (a dependency) compiles it in the thread, whichever way the
// server itself was started (tsx, node --import tsx, vitest).
const tsxApi = pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href.replace(/index\.cjs$/, 'index.mjs');
const workerFile = new URL('./check-worker.ts', import.meta.url).href;
const bootstrap = `import(${JSON.stringify(tsxApi)}).then(({ tsImport }) => tsImport(${JSON.stringify(workerFile)}, ${JSON.stringify(workerFile)}))`;

export function createWorkerEngine(options: WorkerEngineOptions): CheckEngine {
  const size = Math.max(1, options.size ?? availableParallelism() - 1);
  const maxInFlight = options.maxInFlight ?? 200;
  const workers: PoolWorker[] = [];
  let nextId = 1;
  let compiles = 0;
  let inFlight = 0;
  let closed = false;

  function spawn(): PoolWorker {
    const worker = new Worker(bootstrap, { eval: true, execArgv: [] });
    // Idle workers must not keep the process alive; close() ends them explicitly.
    worker.unref();
    const pw: PoolWorker = { worker, sent: new Set(), pending: new Map() };
    worker.on('message', (reply: CheckReplyMessage) => onReply(pw, reply));
    const fail = (err: unknown) => {
      const i = workers.indexOf(pw);
      if (i >= 0) workers.splice(i, 1);
      for (const p of pw.pending.values()) {
        inFlight--;
        p.reject(err instanceof AppError ? err : new InternalError());
      }
      pw.pending.clear();
    };
    worker.on('error', fail);
    worker.on('exit', () => fail(new InternalError()));
    return pw;
  }

  function pick(): PoolWorker {
    while (workers.length < size) workers.push(spawn());
    return workers.reduce((a, b) => (b.pending.size < a.pending.size ? b : a));
  }

  async function send(pw: PoolWorker, id: number, p: Pending): Promise<void> {
    const needsDocument = !pw.sent.has(p.key);
    // Mark before the await: later jobs for the key follow the document in message order.
    if (needsDocument) pw.sent.add(p.key);
    let document: RulesetDocument | undefined;
    if (needsDocument) {
      try {
        document = await options.documentFor(p.job.version);
      } catch (err) {
        pw.sent.delete(p.key);
        pw.pending.delete(id);
        inFlight--;
        p.reject(err);
        return;
      }
    }
    const { version: _version, ...rest } = p.job;
    const msg: CheckJobMessage = { ...rest, id, key: p.key, ...(document ? { document } : {}) };
    pw.worker.postMessage(msg);
  }

  function onReply(pw: PoolWorker, reply: CheckReplyMessage): void {
    const p = pw.pending.get(reply.id);
    if (!p) return;
    if (!reply.ok && reply.kind === 'need-document' && !p.retried) {
      // The worker let this compilation go (its cache is bounded): send the document again.
      pw.sent.delete(p.key);
      p.retried = true;
      void send(pw, reply.id, p);
      return;
    }
    pw.pending.delete(reply.id);
    inFlight--;
    if (reply.ok) {
      if (reply.compiled) compiles++;
      p.resolve({ specification: reply.specification, reportJson: reply.reportJson });
      return;
    }
    if (reply.kind === 'invalid-ruleset') pw.sent.delete(p.key);
    if (reply.kind === 'unknown-class') p.reject(new NotFoundError(reply.message));
    else if (reply.kind === 'invalid-ruleset') p.reject(invalidRuleset(reply.problems ?? []));
    else if (reply.kind === 'invalid-specification') p.reject(new ValidationError(reply.problems ?? []));
    else p.reject(new InternalError());
  }

  return {
    evaluate(job) {
      if (closed) return Promise.reject(new InternalError());
      if (inFlight >= maxInFlight) return Promise.reject(new ChecksBusyError());
      return new Promise<EvaluatedCheck>((resolve, reject) => {
        const pw = pick();
        const id = nextId++;
        const p: Pending = { job, key: compiledCacheKey(job.version), resolve, reject, retried: false };
        pw.pending.set(id, p);
        inFlight++;
        void send(pw, id, p);
      });
    },
    stats: () => ({ mode: 'workers', compiles, workers: workers.length, inFlight }),
    async close() {
      closed = true;
      await Promise.all(workers.splice(0).map((w) => w.worker.terminate()));
    },
  };
}
