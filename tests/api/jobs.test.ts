// Background jobs on pg-boss: a demo job reports its progress (total, done, failed) and ends completed;
// a throwing handler is retried and then ends failed with its message; an admin can run it again; a
// changed queue option reaches a queue an older deployment created; admins of the job's club read the
// progress over the API, other roles are refused and other clubs' jobs do not exist for them.
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '../../backend/src/logger';
import { createJobs, defaultQueueOptions, type Jobs } from '../../backend/src/services/jobs';
import type { JobProgressWire } from '../../backend/src/contracts/jobs';
import { agentFor, demo, demoClubId, hasErrorBody, makeTestApp, signIn, testConfig, useTestDatabase } from './helpers';

const db = useTestDatabase();
let jobs: Jobs;
let app: Express;
let clubId: string;
/** While true, an `explode` job throws (so a retried run can succeed once it is turned off). */
let exploding = true;

/** The demo: counts through `items`, failing the ones listed, yielding between items as handlers must. */
interface CountJob {
  items: number;
  failOn?: number[];
  explode?: boolean;
}

beforeAll(async () => {
  jobs = createJobs(testConfig(), createLogger('silent'), { pollingIntervalSeconds: 0.5, queues: { 'demo.count': { retryLimit: 1, retryDelaySeconds: 1 } } });
  await jobs.start();
  await jobs.work<CountJob>('demo.count', async ({ data, progress }) => {
    if (data.explode && exploding) throw new Error('the rulebook edition could not be read');
    await progress.setTotal(data.items);
    for (let i = 1; i <= data.items; i++) {
      await new Promise((r) => setImmediate(r));
      await progress.advance(data.failOn?.includes(i) ? { failed: 1 } : { done: 1 });
    }
  });
  app = makeTestApp(db.ds, { jobControl: jobs });
  clubId = await demoClubId(db.ds);
}, 60_000);

afterAll(async () => {
  await jobs?.stop();
});

async function settled(jobId: string): Promise<JobProgressWire> {
  const deadline = Date.now() + 15_000;
  for (;;) {
    const p = await jobs.getProgress(jobId);
    if (p && (p.state === 'completed' || p.state === 'failed')) return p;
    if (Date.now() > deadline) throw new Error(`job ${jobId} still ${p?.state}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('jobs', () => {
  it('records a queued job, then its progress up to completed', async () => {
    const id = await jobs.send<CountJob>('demo.count', { items: 5, failOn: [3] }, { clubId });
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    const queued = await jobs.getProgress(id);
    expect(queued?.clubId).toBe(clubId);

    const done = await settled(id);
    expect(done).toMatchObject({
      id,
      queue: 'demo.count',
      state: 'completed',
      total: 5,
      done: 4,
      failed: 1,
      error: null,
      clubId,
    });
    expect(done.finishedAt).not.toBeNull();
  });

  it('retries a throwing job, then marks it failed with the handler’s message', async () => {
    const id = await jobs.send<CountJob>('demo.count', { items: 1, explode: true }, { clubId });
    expect(await settled(id)).toMatchObject({
      state: 'failed',
      error: 'the rulebook edition could not be read (tried 2 times)',
      done: 0,
      attempts: 2,
    });
  });

  it('brings a queue an older deployment created, and the jobs waiting in it, up to the current options', async () => {
    // The old deployment: no retries, as the queues were once created.
    const old = createJobs(testConfig(), createLogger('silent'), { queues: { 'demo.upgrade': { retryLimit: 0, retryDelaySeconds: 0 } } });
    await old.start();
    const waiting = await old.send('demo.upgrade', { n: 1 }, { clubId });
    expect(await old.queueInfo('demo.upgrade')).toMatchObject({ retryLimit: 0 });
    await old.stop();

    const current = createJobs(testConfig(), createLogger('silent'));
    await current.start();
    try {
      await current.send('demo.upgrade', { n: 2 }, { clubId });
      expect(await current.queueInfo('demo.upgrade')).toMatchObject({ retryLimit: defaultQueueOptions.retryLimit, retryDelay: defaultQueueOptions.retryDelaySeconds });
      const rows: { retry_limit: number }[] = await db.ds.query(`SELECT retry_limit FROM pgboss.job WHERE name = 'demo.upgrade' AND id = $1`, [waiting]);
      expect(rows).toEqual([{ retry_limit: defaultQueueOptions.retryLimit }]);
    } finally {
      await current.stop();
    }
  });

  it('creates a queue on first use (pg-boss 10 needs createQueue before send)', async () => {
    const id = await jobs.send('demo.never-worked', { n: 1 }, { clubId });
    expect(await jobs.getProgress(id)).toMatchObject({ state: 'queued', total: null });
  });
});

describe('GET /api/jobs/:id', () => {
  let jobId: string;
  beforeAll(async () => {
    jobId = await jobs.send<CountJob>('demo.count', { items: 2 }, { clubId });
    await settled(jobId);
  });

  it('shows an admin of the job’s club the progress', async () => {
    const agent = agentFor(app);
    await signIn(agent, demo.admin);
    const res = await agent.get(`/api/jobs/${jobId}`).expect(200);
    expect(res.body).toEqual({
      job: {
        id: jobId,
        queue: 'demo.count',
        state: 'completed',
        total: 2,
        done: 2,
        failed: 0,
        error: null,
        attempts: 1,
        createdAt: expect.any(String),
        updatedAt: expect.any(String),
        finishedAt: expect.any(String),
        // This job kept no result (the impact and the publish re-check do).
        result: null,
      },
    });
  });

  it('lets an admin run a finally failed job again, from the API, and only a failed one', async () => {
    exploding = true;
    const failedId = await jobs.send<CountJob>('demo.count', { items: 3, explode: true }, { clubId });
    expect((await settled(failedId)).state).toBe('failed');
    const agent = agentFor(app);
    const token = await signIn(agent, demo.admin);
    exploding = false;
    const res = await agent.post(`/api/jobs/${failedId}/retry`).set('X-CSRF-Token', token).expect(202);
    expect(res.body.job).toMatchObject({ id: failedId, state: 'queued', error: null });
    expect(await settled(failedId)).toMatchObject({ state: 'completed', done: 3, error: null, attempts: 3 });
    // A job that did not fail cannot be run again.
    await agent.post(`/api/jobs/${jobId}/retry`).set('X-CSRF-Token', token).expect(409);
    const builder = agentFor(app);
    const builderToken = await signIn(builder, demo.builder);
    await builder.post(`/api/jobs/${failedId}/retry`).set('X-CSRF-Token', builderToken).expect(403);
  });

  it.each([demo.builder, demo.steward])('refuses %s (member, not admin) with 403', async (email) => {
    const agent = agentFor(app);
    await signIn(agent, email);
    await agent
      .get(`/api/jobs/${jobId}`)
      .expect(403).expect(hasErrorBody({ error: { code: 'forbidden', message: 'Your role does not allow this.' } }));
  });

  it('hides another club’s job and an unknown one (404), and refuses the signed-out (401)', async () => {
    const other: { id: string }[] = await db.ds.query(
      `INSERT INTO clubs (slug, name) VALUES ('moss-end', 'Moss End Autograss') RETURNING id`,
    );
    const foreign = await jobs.send('demo.never-worked', { n: 2 }, { clubId: other[0]!.id });
    const agent = agentFor(app);
    await signIn(agent, demo.admin);
    const notFound = { error: { code: 'not_found', message: 'Job not found.' } };
    await agent.get(`/api/jobs/${foreign}`).expect(404).expect(hasErrorBody(notFound));
    await agent.get('/api/jobs/00000000-0000-4000-8000-000000000000').expect(404).expect(hasErrorBody(notFound));
    await agent.get('/api/jobs/nope').expect(400);
    await agentFor(app).get(`/api/jobs/${jobId}`).expect(401);
  });
});
