// Background jobs on pg-boss 10, in the same PostgreSQL (schema `pgboss`, a small guarded pool of its
// own). `createJobs(config, logger)` gives start/stop, send, work, retry and getProgress. Every queue is
// created (createQueue, idempotent) and then updated to the options below before its first send or
// work, so a changed option also reaches a queue an older deployment created (createQueue alone leaves an
// existing queue as it was), and jobs already waiting in it get the new retry options too.
// Jobs that finish (docs/decisions/0007-jobs-that-finish.md): a job is retried (retryLimit) after its
// handler throws, and after its worker died: the running attempt writes a heartbeat every few seconds,
// and a job whose heartbeat this process has seen standing still for `staleAfterSeconds` (while this
// process could reach the database) is handed back to pg-boss as failed, which retries it. Handlers
// must therefore be resumable and idempotent: continue from what they stored, never repeat an effect.
// Workers run in the server process: pg-boss polls and calls the handler with async I/O, so a handler
// must not hold the event loop. CPU-heavy work belongs in worker threads.
import { randomUUID } from 'node:crypto';
import PgBoss from 'pg-boss';
import type { Config } from '../../config';
import type { JobResultWire } from '../../contracts/jobs';
import { createGuardedPool } from '../../db/pg-pool';
import { errorFields, type Logger } from '../../logger';
import { createJobProgressStore, type JobControl, type JobProgress } from './progress';

export interface ProgressReporter {
  /** How many items the job will handle (shown as done/total). */
  setTotal(total: number): Promise<void>;
  /** Adds to the counts of handled items. Throws JobSupersededError once another attempt owns the job. */
  advance(counts: { done?: number; failed?: number }): Promise<void>;
  /** Sets the counts outright: a resumed attempt starts from what earlier attempts stored. */
  resumeFrom(counts: { done: number; failed?: number }): Promise<void>;
  /** Keeps what the job produced with its progress (shown once it completes). */
  setResult(result: JobResultWire): Promise<void>;
}

export interface JobContext<T> {
  id: string;
  data: T;
  progress: ProgressReporter;
  /** 1 for the first run, 2 for the first retry or resumption, … */
  attempt: number;
}

export type JobHandler<T> = (job: JobContext<T>) => Promise<void>;

export interface SendOptions {
  /** The club the job belongs to; its admins may read the progress. */
  clubId?: string | null;
  requestedBy?: string | null;
  /** Known up front, or set later by the handler. */
  total?: number | null;
}

export interface QueueOptions {
  /** Retries after the first attempt fails or its worker dies. */
  retryLimit: number;
  /** Seconds before the first retry; doubled (with jitter) for each further one. */
  retryDelaySeconds: number;
  /** pg-boss's own last resort for an attempt that never ends; the heartbeat check acts long before. */
  expireInSeconds: number;
}

export const defaultQueueOptions: QueueOptions = { retryLimit: 4, retryDelaySeconds: 5, expireInSeconds: 4 * 3600 };

export interface JobsOptions {
  /** How often an idle worker asks for work; default 2 s (pg-boss allows 0.5 s at least). */
  pollingIntervalSeconds?: number;
  schema?: string;
  /** Options per queue name; others get defaultQueueOptions. */
  queues?: Record<string, Partial<QueueOptions>>;
  /** A running job whose heartbeat stood still this long is retried elsewhere; default 30 s. */
  staleAfterSeconds?: number;
  /** How often the running attempt writes its heartbeat; default a sixth of staleAfterSeconds. */
  heartbeatSeconds?: number;
  /**
   * Run pg-boss's cron timekeeper so `schedule` fires (the server turns it on; tests leave it off).
   * Every process may run it: pg-boss sends one job per schedule and minute whichever process fires.
   */
  cron?: boolean;
}

export interface Jobs extends JobControl {
  start(): Promise<void>;
  stop(): Promise<void>;
  send<T extends object>(queue: string, data: T, options?: SendOptions): Promise<string>;
  work<T extends object>(queue: string, handler: JobHandler<T>): Promise<string>;
  getProgress(jobId: string): Promise<JobProgress | null>;
  /** Looks for jobs whose worker died now (it also runs on a timer); returns the ids handed back. */
  reapStale(): Promise<string[]>;
  /**
   * Sends a job to `queue` on a cron schedule (UTC), for every process of the deployment: stored by
   * pg-boss under the queue's name, so calling it again (each start, each process) replaces it.
   */
  schedule(queue: string, cron: string, data?: object): Promise<void>;
  /** The queue as pg-boss has it (tests check the options reached it). */
  queueInfo(name: string): Promise<{ retryLimit: number; retryDelay: number; expireInSeconds: number } | null>;
}

/**
 * Thrown by a handler that can never succeed however often it is tried (the draft it was asked about
 * is gone, say): the job fails at once with this message, without retries.
 */
export class FinalJobError extends Error {
  override name = 'FinalJobError';
}

/** Thrown by a reporter of an attempt whose job another attempt now owns: stop quietly. */
export class JobSupersededError extends Error {
  override name = 'JobSupersededError';
  constructor() {
    super('Another attempt of this job has taken over.');
  }
}

const staleMessage = 'The server running this job stopped before it finished.';

export function createJobs(config: Pick<Config, 'databaseUrl'>, logger: Logger, options: JobsOptions = {}): Jobs {
  const schema = options.schema ?? 'pgboss';
  // pg-boss's own pool would attach no listener to its clients (db/pg-pool.ts); it gets ours instead,
  // which this module opens and closes with the queue.
  const pool = createGuardedPool(
    'jobs',
    { connectionString: config.databaseUrl, max: 3, application_name: 'cagewright-jobs', connectionTimeoutMillis: 5000, idleTimeoutMillis: 30_000 },
    (err) => logger.debug('job queue connection error', { err: err.message }),
  );
  const sql = async (text: string, values: unknown[] = []) => (await pool.query(text, values)).rows as unknown[];
  const boss = new PgBoss({
    db: { executeSql: (text, values) => pool.query(text, values) },
    schema,
    // Cron schedules (expiry reminders) only where asked for; otherwise skip their polling.
    schedule: options.cron ?? false,
  });
  boss.on('error', (err) => logger.warn('job queue error', { ...errorFields(err), stack: undefined }));
  const progress = createJobProgressStore(sql);
  const queues = new Map<string, Promise<void>>();
  const worked = new Set<string>();
  // pg-boss's worker id per queue this process works, to wake it when this process sends to it.
  const workerIds = new Map<string, string>();
  const staleMs = (options.staleAfterSeconds ?? 30) * 1000;
  const heartbeatMs = (options.heartbeatSeconds ?? staleMs / 6000) * 1000;
  let started = false;
  let reaper: NodeJS.Timeout | null = null;

  function optionsOf(name: string): QueueOptions {
    return { ...defaultQueueOptions, ...options.queues?.[name] };
  }

  function ensureQueue(name: string): Promise<void> {
    let ready = queues.get(name);
    if (!ready) {
      const o = optionsOf(name);
      const bossOptions = { name, retryLimit: o.retryLimit, retryDelay: o.retryDelaySeconds, retryBackoff: true, expireInSeconds: o.expireInSeconds };
      ready = (async () => {
        await boss.createQueue(name, bossOptions);
        await boss.updateQueue(name, bossOptions);
        // Jobs copy the queue's options when they are sent: bring waiting and running ones up to date.
        await sql(
          `UPDATE ${schema}.job SET retry_limit = $2, retry_delay = $3, retry_backoff = true, expire_in = make_interval(secs => $4)
           WHERE name = $1 AND state < 'completed' AND (retry_limit <> $2 OR retry_delay <> $3 OR expire_in <> make_interval(secs => $4))`,
          [name, o.retryLimit, o.retryDelaySeconds, o.expireInSeconds],
        );
      })();
      ready.catch(() => queues.delete(name));
      queues.set(name, ready);
    }
    return ready;
  }

  function assertStarted(): void {
    if (!started) throw new Error('jobs: call start() first');
  }

  // Heartbeats this process saw, with when it first saw each unchanged. A job is taken over only after
  // its heartbeat stood still for staleMs of this process's own uninterrupted view of the database, so a
  // worker that merely lost the database for a while (and so could not beat) is not taken over on return.
  const seen = new Map<string, { beat: string | null; attempts: number; since: number }>();

  async function reapStale(): Promise<string[]> {
    if (!started || worked.size === 0) return [];
    let rows: Awaited<ReturnType<typeof progress.running>>;
    try {
      rows = await progress.running([...worked]);
    } catch (err) {
      seen.clear();
      logger.debug('stale-job check skipped', { err: err instanceof Error ? err.message : String(err) });
      return [];
    }
    const now = Date.now();
    const taken: string[] = [];
    const current = new Set(rows.map((r) => r.jobId));
    for (const id of seen.keys()) if (!current.has(id)) seen.delete(id);
    for (const r of rows) {
      const before = seen.get(r.jobId);
      if (!before || before.beat !== r.heartbeatAt || before.attempts !== r.attempts) {
        seen.set(r.jobId, { beat: r.heartbeatAt, attempts: r.attempts, since: now });
        continue;
      }
      if (now - before.since < staleMs) continue;
      seen.delete(r.jobId);
      try {
        if (!(await progress.takeOver(r.jobId, r.attempts, r.heartbeatAt, staleMessage))) continue;
        await boss.fail(r.queue, r.jobId, { message: staleMessage });
        const job = await boss.getJobById(r.queue, r.jobId);
        if (job?.state === 'failed') {
          await progress.finish(r.jobId, 'failed', `${staleMessage} It was tried ${job.retryCount + 1} times.`);
        }
        logger.warn('job handed back for a retry: its worker stopped', { queue: r.queue, jobId: r.jobId, attempt: r.attempts, state: job?.state });
        taken.push(r.jobId);
      } catch (err) {
        logger.warn('stale job could not be handed back; next check retries', { jobId: r.jobId, ...errorFields(err), stack: undefined });
      }
    }
    return taken;
  }

  return {
    async start() {
      if (started) return;
      await boss.start();
      started = true;
      reaper = setInterval(() => void reapStale(), Math.max(250, Math.min(heartbeatMs, 5000)));
      reaper.unref();
    },

    async stop() {
      if (!started) return;
      started = false;
      if (reaper) clearInterval(reaper);
      // Lets running handlers finish (up to 10 s); pg-boss then fails what still runs, so it is retried.
      await boss.stop({ graceful: true, timeout: 10_000, wait: true });
      await pool.end();
    },

    async send(queue, data, opts = {}) {
      assertStarted();
      await ensureQueue(queue);
      const jobId = randomUUID();
      await progress.create({
        jobId,
        queue,
        clubId: opts.clubId ?? null,
        requestedBy: opts.requestedBy ?? null,
        total: opts.total ?? null,
      });
      try {
        const id = await boss.send(queue, data, { id: jobId });
        if (id !== jobId) throw new Error(`pg-boss did not take job ${jobId} (answered ${String(id)})`);
      } catch (err) {
        await progress.remove(jobId);
        throw err;
      }
      // Sent here and worked here: start now rather than at the next poll (an admin waits for it).
      const local = workerIds.get(queue);
      if (local) boss.notifyWorker(local);
      return jobId;
    },

    async work(queue, handler) {
      assertStarted();
      await ensureQueue(queue);
      worked.add(queue);
      const workerId = await boss.work<Parameters<typeof handler>[0]['data']>(
        queue,
        { pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2, batchSize: 1, includeMetadata: true },
        async (batch) => {
          for (const job of batch) {
            const attempt = (await progress.start(job.id)) ?? job.retryCount + 1;
            let lost = false;
            const beat = setInterval(() => {
              progress.heartbeat(job.id, attempt).then(
                (ok) => (lost ||= !ok),
                () => undefined, // the database is away; the next beat tries again
              );
            }, heartbeatMs);
            beat.unref();
            const reporter: ProgressReporter = {
              setTotal: (total) => progress.setTotal(job.id, total),
              advance: async ({ done = 0, failed = 0 }) => {
                if (lost) throw new JobSupersededError();
                await progress.advance(job.id, done, failed);
              },
              resumeFrom: ({ done, failed = 0 }) => progress.setCounts(job.id, done, failed),
              setResult: (result) => progress.setResult(job.id, attempt, result),
            };
            try {
              await handler({ id: job.id, data: job.data, progress: reporter, attempt });
              if (!lost) await progress.finish(job.id, 'completed', null, attempt);
            } catch (err) {
              if (lost || err instanceof JobSupersededError) {
                // Another attempt owns the job now; whatever this one stored stays, the rest is theirs.
                logger.warn('job attempt superseded', { queue, jobId: job.id, attempt });
                return;
              }
              if (err instanceof FinalJobError) {
                // Trying again cannot help: failed for good now (pg-boss counts the job as done).
                logger.warn('job cannot run', { queue, jobId: job.id, attempt, reason: err.message });
                await progress.finish(job.id, 'failed', err.message.slice(0, 2000), attempt).catch(() => undefined);
                return;
              }
              const message = (err instanceof Error ? err.message : String(err)).slice(0, 2000);
              const final = job.retryCount >= job.retryLimit;
              logger.error(final ? 'job failed' : 'job attempt failed, will retry', { queue, jobId: job.id, attempt, ...errorFields(err) });
              await progress
                .finish(job.id, final ? 'failed' : 'retrying', final && job.retryLimit > 0 ? `${message} (tried ${attempt} times)` : message, attempt)
                .catch(() => undefined);
              throw err;
            } finally {
              clearInterval(beat);
            }
          }
        },
      );
      workerIds.set(queue, workerId);
      return workerId;
    },

    async retry(jobId) {
      assertStarted();
      const p = await progress.get(jobId);
      if (!p) throw new Error(`jobs: no job ${jobId}`);
      await ensureQueue(p.queue);
      // pg-boss 10 answers { affected } here, though its types say void.
      const moved = (await boss.retry(p.queue, jobId)) as unknown as { affected?: number } | undefined;
      if (!moved?.affected) {
        // Archived by pg-boss since it failed: send it again under the same id (it resumes all the same).
        const old = await boss.getJobById<object>(p.queue, jobId, { includeArchive: true });
        if (!old) throw new Error(`jobs: job ${jobId} is gone from the queue`);
        await boss.send(p.queue, old.data, { id: jobId });
      }
      await progress.requeue(jobId);
    },

    getProgress(jobId) {
      assertStarted();
      return progress.get(jobId);
    },

    reapStale,

    async schedule(queue, cron, data = {}) {
      assertStarted();
      await ensureQueue(queue);
      await boss.schedule(queue, cron, data, { tz: 'UTC' });
    },

    async queueInfo(name) {
      const q = (await boss.getQueue(name)) as { retryLimit: number; retryDelay: number; expireInSeconds: number } | null;
      return q ? { retryLimit: q.retryLimit, retryDelay: q.retryDelay, expireInSeconds: q.expireInSeconds } : null;
    },
  };
}
