// Progress of background jobs (job_progress): one row per job, written by the jobs wrapper and the
// handler's reporter, read by GET /api/jobs/:id. Each start of a worker on the job is an attempt
// (`attempts`); the running attempt writes `heartbeat_at` every few seconds, and writes of an attempt
// that has been superseded (a stale heartbeat handed the job to another worker) change nothing. The club is kept with the row so that only that club's
// admins see it. Works over any `query` function, so the pg-boss pool and the app's DataSource share it.
import type { JobProgressWire, JobResultWire, JobState } from '../../contracts/jobs';
import type { DataSource } from 'typeorm';
import { ConflictError, NotFoundError } from '../../errors';
import { enforce, rolesIn } from '../access';

export type SqlQuery = (text: string, values: unknown[]) => Promise<unknown[]>;

export interface JobProgress extends JobProgressWire {
  clubId: string | null;
  requestedBy: string | null;
}

interface Row {
  job_id: string;
  queue: string;
  club_id: string | null;
  requested_by: string | null;
  state: JobState;
  total: number | null;
  done: number;
  failed: number;
  error: string | null;
  attempts: number;
  heartbeat_at: Date | null;
  created_at: Date;
  updated_at: Date;
  finished_at: Date | null;
  result: JobResultWire | null;
}

function fromRow(r: Row): JobProgress {
  return {
    id: r.job_id,
    queue: r.queue,
    clubId: r.club_id,
    requestedBy: r.requested_by,
    state: r.state,
    total: r.total,
    done: r.done,
    failed: r.failed,
    error: r.error,
    attempts: r.attempts,
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
    finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
    // Shown once the job has completed (a retried attempt may have left an older one behind).
    result: r.state === 'completed' ? r.result : null,
  };
}

export type JobProgressStore = ReturnType<typeof createJobProgressStore>;

export function createJobProgressStore(query: SqlQuery) {
  return {
    async create(p: {
      jobId: string;
      queue: string;
      clubId: string | null;
      requestedBy: string | null;
      total: number | null;
    }): Promise<void> {
      await query(
        `INSERT INTO job_progress (job_id, queue, club_id, requested_by, total) VALUES ($1, $2, $3, $4, $5)`,
        [p.jobId, p.queue, p.clubId, p.requestedBy, p.total],
      );
    },
    async remove(jobId: string): Promise<void> {
      await query(`DELETE FROM job_progress WHERE job_id = $1`, [jobId]);
    },
    /** A worker starts (or resumes) the job: returns the attempt's number, null when the job has no row. */
    async start(jobId: string): Promise<number | null> {
      const rows = (await query(
        `UPDATE job_progress SET state = 'running', attempts = attempts + 1, heartbeat_at = now(), error = NULL, finished_at = NULL, updated_at = now()
         WHERE job_id = $1 RETURNING attempts`,
        [jobId],
      )) as { attempts: number }[];
      return rows[0]?.attempts ?? null;
    },
    /** The running attempt is alive; false when it is no longer the job's current attempt. */
    async heartbeat(jobId: string, attempt: number): Promise<boolean> {
      const rows = await query(
        `UPDATE job_progress SET heartbeat_at = now() WHERE job_id = $1 AND attempts = $2 AND state = 'running' RETURNING job_id`,
        [jobId, attempt],
      );
      return rows.length > 0;
    },
    /** Absolute counts (a resumed attempt starts from what earlier attempts stored). */
    async setCounts(jobId: string, done: number, failed: number): Promise<void> {
      await query(`UPDATE job_progress SET done = $2, failed = $3, updated_at = now() WHERE job_id = $1`, [jobId, done, failed]);
    },
    /** Jobs of `queues` that claim to be running, with their last heartbeat (for the stale-job check). */
    async running(queues: readonly string[]): Promise<{ jobId: string; queue: string; attempts: number; heartbeatAt: string | null }[]> {
      const rows = (await query(
        `SELECT job_id, queue, attempts, heartbeat_at::text AS heartbeat_at FROM job_progress WHERE state = 'running' AND queue = ANY($1::text[])`,
        [queues],
      )) as { job_id: string; queue: string; attempts: number; heartbeat_at: string | null }[];
      return rows.map((r) => ({ jobId: r.job_id, queue: r.queue, attempts: r.attempts, heartbeatAt: r.heartbeat_at }));
    },
    /** Takes a running attempt away if it is still the one seen (one process wins); true when taken. */
    async takeOver(jobId: string, attempt: number, heartbeatAt: string | null, error: string): Promise<boolean> {
      const rows = await query(
        `UPDATE job_progress SET state = 'retrying', error = $4, updated_at = now()
         WHERE job_id = $1 AND attempts = $2 AND state = 'running' AND heartbeat_at IS NOT DISTINCT FROM $3::timestamptz RETURNING job_id`,
        [jobId, attempt, heartbeatAt, error],
      );
      return rows.length > 0;
    },
    /** An admin runs a finally failed job again. */
    async requeue(jobId: string): Promise<void> {
      await query(`UPDATE job_progress SET state = 'queued', error = NULL, finished_at = NULL, updated_at = now() WHERE job_id = $1`, [jobId]);
    },
    /** The attempt's outcome; only while it is still the job's current attempt. */
    async setResult(jobId: string, attempt: number, result: JobResultWire): Promise<void> {
      await query(`UPDATE job_progress SET result = $3::jsonb, updated_at = now() WHERE job_id = $1 AND attempts = $2`, [jobId, attempt, JSON.stringify(result)]);
    },
    async setTotal(jobId: string, total: number): Promise<void> {
      await query(`UPDATE job_progress SET total = $2, updated_at = now() WHERE job_id = $1`, [jobId, total]);
    },
    async advance(jobId: string, done: number, failed: number): Promise<void> {
      await query(
        `UPDATE job_progress SET done = done + $2, failed = failed + $3, updated_at = now() WHERE job_id = $1`,
        [jobId, done, failed],
      );
    },
    /** Ends an attempt; with `attempt`, only while it is still the job's current one. */
    async finish(jobId: string, state: 'completed' | 'failed' | 'retrying', error: string | null = null, attempt: number | null = null): Promise<void> {
      await query(
        `UPDATE job_progress SET state = $2::varchar, error = $3, updated_at = now(), finished_at = CASE WHEN $2::varchar = 'retrying' THEN NULL ELSE now() END
         WHERE job_id = $1 AND ($4::int IS NULL OR attempts = $4::int)`,
        [jobId, state, error, attempt],
      );
    },
    async get(jobId: string): Promise<JobProgress | null> {
      const rows = (await query(`SELECT * FROM job_progress WHERE job_id = $1`, [jobId])) as Row[];
      return rows[0] ? fromRow(rows[0]) : null;
    },
  };
}

export type JobProgressReader = ReturnType<typeof createJobProgressReader>;

/**
 * Progress as the API shows it: the access policy's `job.admin`, only to admins of the job's club. Not a
 * member (or a job without a club) reads as 404, as for any club thing; a member without the admin role
 * gets 403.
 */
export function createJobProgressReader(store: Pick<JobProgressStore, 'get'>, ds: DataSource) {
  async function forAdmin(userId: string, jobId: string): Promise<JobProgressWire> {
    const progress = await store.get(jobId);
    if (!progress) throw new NotFoundError('Job not found.');
    const roles = progress.clubId ? await rolesIn(ds.manager, userId, progress.clubId) : null;
    enforce('job.admin', { actorId: userId, roles }, { notFound: 'Job not found.' });
    const { clubId: _clubId, requestedBy: _requestedBy, ...wire } = progress;
    return wire;
  }
  return {
    forAdmin,
    /** Runs a finally failed job again (it resumes from what it stored); only its club's admins may. */
    async retryForAdmin(userId: string, jobId: string, control: JobControl | null): Promise<JobProgressWire> {
      const job = await forAdmin(userId, jobId);
      if (job.state !== 'failed') throw new ConflictError(`This job is ${job.state}; only a job that stopped can be run again.`);
      if (!control) throw new ConflictError('Background jobs are not running on this server.');
      await control.retry(jobId);
      return forAdmin(userId, jobId);
    },
  };
}

/** What the API needs of the job queue to run a failed job again (server.ts passes the pg-boss wrapper). */
export interface JobControl {
  retry(jobId: string): Promise<void>;
}
