// Progress of background jobs (job_progress): one row per job, written by the jobs wrapper and the
// handler's reporter, read by GET /api/jobs/:id. The club is kept with the row so that only that club's
// admins see it. Works over any `query` function, so the pg-boss pool and the app's DataSource share it.
import type { JobProgressWire, JobState } from '../../contracts/jobs';
import { ForbiddenError, NotFoundError } from '../../errors';

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
  created_at: Date;
  updated_at: Date;
  finished_at: Date | null;
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
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
    finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
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
    async start(jobId: string): Promise<void> {
      await query(`UPDATE job_progress SET state = 'running', updated_at = now() WHERE job_id = $1`, [jobId]);
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
    async finish(jobId: string, state: 'completed' | 'failed', error: string | null = null): Promise<void> {
      await query(
        `UPDATE job_progress SET state = $2, error = $3, updated_at = now(), finished_at = now() WHERE job_id = $1`,
        [jobId, state, error],
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
 * Progress as the API shows it: only to admins of the job's club. Not a member (or a job without a club)
 * reads as 404, as for any club thing; a member without the admin role gets 403.
 */
export function createJobProgressReader(
  store: Pick<JobProgressStore, 'get'>,
  members: { rolesInClub(userId: string, clubId: string): Promise<readonly string[] | null> },
) {
  return {
    async forAdmin(userId: string, jobId: string): Promise<JobProgressWire> {
      const progress = await store.get(jobId);
      const roles = progress?.clubId ? await members.rolesInClub(userId, progress.clubId) : null;
      if (!progress || roles === null) throw new NotFoundError('Job not found.');
      if (!roles.includes('admin')) throw new ForbiddenError();
      const { clubId: _clubId, requestedBy: _requestedBy, ...wire } = progress;
      return wire;
    },
  };
}
