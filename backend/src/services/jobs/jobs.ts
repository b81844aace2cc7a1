// Background jobs on pg-boss 10, in the same PostgreSQL (schema `pgboss`, its own small pool).
// `createJobs(config, logger)` gives start/stop, send, work and getProgress. Every queue is created
// (createQueue, idempotent) before its first send or work, as pg-boss 10 requires.
// Workers run in the server process: pg-boss polls and calls the handler with async I/O, so a handler
// must not hold the event loop. CPU-heavy work (hundreds of rule checks in a row) must yield between
// items (`await setImmediate()` from node:timers/promises) or run in a worker thread.
import { randomUUID } from 'node:crypto';
import PgBoss from 'pg-boss';
import type { Config } from '../../config';
import { createGuardedPool } from '../../db/pg-pool';
import { errorFields, type Logger } from '../../logger';
import { createJobProgressStore, type JobProgress } from './progress';

export interface ProgressReporter {
  /** How many items the job will handle (shown as done/total). */
  setTotal(total: number): Promise<void>;
  /** Adds to the counts of handled items. */
  advance(counts: { done?: number; failed?: number }): Promise<void>;
}

export interface JobContext<T> {
  id: string;
  data: T;
  progress: ProgressReporter;
}

export type JobHandler<T> = (job: JobContext<T>) => Promise<void>;

export interface SendOptions {
  /** The club the job belongs to; its admins may read the progress. */
  clubId?: string | null;
  requestedBy?: string | null;
  /** Known up front, or set later by the handler. */
  total?: number | null;
}

export interface JobsOptions {
  /** How often an idle worker asks for work; default 2 s (pg-boss allows 0.5 s at least). */
  pollingIntervalSeconds?: number;
  schema?: string;
}

export interface Jobs {
  start(): Promise<void>;
  stop(): Promise<void>;
  send<T extends object>(queue: string, data: T, options?: SendOptions): Promise<string>;
  work<T extends object>(queue: string, handler: JobHandler<T>): Promise<string>;
  getProgress(jobId: string): Promise<JobProgress | null>;
}

export function createJobs(
  config: Pick<Config, 'databaseUrl'>,
  logger: Logger,
  options: JobsOptions = {},
): Jobs {
  // pg-boss's own pool would attach no listener to its clients (db/pg-pool.ts); it gets ours instead,
  // which this module opens and closes with the queue.
  const pool = createGuardedPool(
    'jobs',
    { connectionString: config.databaseUrl, max: 3, application_name: 'cagewright-jobs', connectionTimeoutMillis: 5000, idleTimeoutMillis: 30_000 },
    (err) => logger.debug('job queue connection error', { err: err.message }),
  );
  const boss = new PgBoss({
    db: { executeSql: (text, values) => pool.query(text, values) },
    schema: options.schema ?? 'pgboss',
    // No cron schedules are used; skip their polling.
    schedule: false,
  });
  boss.on('error', (err) => logger.warn('job queue error', { ...errorFields(err), stack: undefined }));
  const progress = createJobProgressStore(
    async (text, values) => (await boss.getDb().executeSql(text, values)).rows,
  );
  const queues = new Map<string, Promise<void>>();
  let started = false;

  function ensureQueue(name: string): Promise<void> {
    let ready = queues.get(name);
    if (!ready) {
      // No pg-boss retries: a retried job would restart its progress; handlers decide what to repeat.
      ready = boss.createQueue(name, { name, retryLimit: 0 });
      ready.catch(() => queues.delete(name));
      queues.set(name, ready);
    }
    return ready;
  }

  function assertStarted(): void {
    if (!started) throw new Error('jobs: call start() first');
  }

  return {
    async start() {
      if (started) return;
      await boss.start();
      started = true;
    },

    async stop() {
      if (!started) return;
      started = false;
      // Lets running handlers finish (up to 10 s), then closes the pool.
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
      return jobId;
    },

    async work(queue, handler) {
      assertStarted();
      await ensureQueue(queue);
      return boss.work<Parameters<typeof handler>[0]['data']>(
        queue,
        { pollingIntervalSeconds: options.pollingIntervalSeconds ?? 2, batchSize: 1 },
        async (batch) => {
          for (const job of batch) {
            await progress.start(job.id);
            const reporter: ProgressReporter = {
              setTotal: (total) => progress.setTotal(job.id, total),
              advance: ({ done = 0, failed = 0 }) => progress.advance(job.id, done, failed),
            };
            try {
              await handler({ id: job.id, data: job.data, progress: reporter });
              await progress.finish(job.id, 'completed');
            } catch (err) {
              const message = err instanceof Error ? err.message : String(err);
              logger.error('job failed', { queue, jobId: job.id, ...errorFields(err) });
              await progress.finish(job.id, 'failed', message.slice(0, 2000));
              throw err;
            }
          }
        },
      );
    },

    getProgress(jobId) {
      assertStarted();
      return progress.get(jobId);
    },
  };
}
