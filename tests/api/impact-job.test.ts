// Work off the request path (issue 12, §7), on pg-boss: the impact of a draft is a background job with
// progress like the publish re-check, and its summary is the job's result; a draft deleted before the
// job runs fails it at once with the reason and no retries; both re-checks run in the bulk pool of
// worker threads (every core it was given), so a builder's check during a re-check of hundreds of
// sheets is answered, never refused with `checks_busy`, although the bulk pool has far more in flight
// than the interactive pool would ever take.
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobProgressWire } from '../../backend/src/contracts/jobs';
import { createLogger } from '../../backend/src/logger';
import { createServices, type Services } from '../../backend/src/services';
import { createJobs, type Jobs } from '../../backend/src/services/jobs';
import { registerImpactWorker } from '../../backend/src/services/publish/impact-job';
import { registerRepublishWorker } from '../../backend/src/services/publish/republish-job';
import { makeTestApp, testConfig, testPublicUrl, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, type GarageFixture, type SignedIn } from './garage-fixtures';
import { passingSaloonSpec, withSaloonWall, type DocLike } from './rulebook-admin-fixtures';

const db = useTestDatabase();
let jobs: Jobs;
let services: Services;
let app: Express;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;

// The interactive pool refuses a fifth check in flight; the bulk pool has two threads of its own.
const interactiveMaxInFlight = 4;
const bulkThreads = 2;

beforeAll(async () => {
  fx = await garageFixture(db.ds);
  services = createServices(db.ds, { publicUrl: testPublicUrl, recheckBatchSize: 50, checks: { workers: 1, maxInFlight: interactiveMaxInFlight, recheckWorkers: bulkThreads } });
  jobs = createJobs(testConfig(), createLogger('silent'), { pollingIntervalSeconds: 0.5 });
  await jobs.start();
  app = makeTestApp(db.ds, { services, republishQueue: jobs, jobControl: jobs });
  who = await everyone(app);
}, 60_000);

afterAll(async () => {
  await jobs?.stop();
});

const post = (s: SignedIn, url: string) => s.agent.post(url).set('X-CSRF-Token', s.token);

async function settled(admin: SignedIn, jobId: string, timeoutMs = 60_000): Promise<JobProgressWire> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const job = (await admin.agent.get(`/api/jobs/${jobId}`).expect(200)).body.job as JobProgressWire;
    if (job.state === 'completed' || job.state === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`job still ${job.state} (${job.done}/${job.total})`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A draft raising the saloon walls to 0.120 in (demo rulebook in inches; F-UNIT-1: 1 in = 25.4 mm). */
async function stricterDraft(): Promise<{ id: string; lockVersion: number }> {
  const draft = (await post(who.admin, `/api/rulebooks/${fx.rulebookId}/drafts`).expect(201)).body.version as { id: string; lockVersion: number; document: DocLike };
  const saved = await who.admin.agent.put(`/api/ruleset-drafts/${draft.id}`).set('X-CSRF-Token', who.admin.token)
    .send({ lockVersion: draft.lockVersion, document: withSaloonWall(draft.document, 0.12) }).expect(200);
  return { id: draft.id, lockVersion: saved.body.draft.lockVersion as number };
}

/** `n` more saloon sheets of the builder's, passing as stored, written in SQL (one revision each). */
async function manySheets(n: number): Promise<void> {
  const [builder] = await db.ds.query(`SELECT id FROM users WHERE email = 'builder@tarnwick.example'`);
  const [car] = await db.ds.query(`INSERT INTO cars (owner_id, name, chassis_type) VALUES ($1, 'Fleet car', 'unibody') RETURNING id`, [builder.id]);
  await db.ds.query(
    `INSERT INTO build_sheets (car_id, name, club_id, rulebook_id, ruleset_version_id, class_id, current_revision, latest_verdict, latest_checked_revision)
     SELECT $1, 'Fleet sheet ' || g, $2, $3, $4, 'club-saloon', 1, 'pass', 1 FROM generate_series(1, $5::int) g`,
    [car.id, fx.clubId, fx.rulebookId, fx.versionId, n],
  );
  await db.ds.query(
    `INSERT INTO build_sheet_revisions (build_sheet_id, number, specification, ruleset_version_id, class_id, created_by)
     SELECT s.id, 1, $1::jsonb, $2, 'club-saloon', $3 FROM build_sheets s WHERE s.car_id = $4`,
    [JSON.stringify(passingSaloonSpec()), fx.versionId, builder.id, car.id],
  );
}

describe('the impact of a draft, as a background job', () => {
  it('reports progress and keeps the summary as the job’s result', async () => {
    await registerImpactWorker(jobs, { rulebookAdmin: services.rulebookAdmin });
    const { sheetId } = await carWithSheet(who.builder, fx, passingSaloonSpec());
    expect((await post(who.builder, `/api/build-sheets/${sheetId}/check-runs`).expect(201)).body.checkRun.overallVerdict).toBe('pass');
    const draft = await stricterDraft();

    const started = await post(who.admin, `/api/ruleset-drafts/${draft.id}/impact`).expect(202);
    const queued = started.body.job as JobProgressWire;
    expect(queued).toMatchObject({ queue: 'ruleset.impact', result: null });
    expect(['queued', 'running', 'completed']).toContain(queued.state);
    // Only the club's admins read it.
    await who.builder.agent.get(`/api/jobs/${queued.id}`).expect(403);
    await who.outsider.agent.get(`/api/jobs/${queued.id}`).expect(404);

    const job = await settled(who.admin, queued.id);
    expect(job).toMatchObject({ state: 'completed', total: 1, done: 1, failed: 0, attempts: 1, error: null });
    expect(job.result).toEqual({
      kind: 'impact',
      impact: {
        versionId: draft.id,
        lockVersion: draft.lockVersion,
        classIds: ['club-saloon'],
        checked: 1,
        failed: 0,
        counts: { passToFail: 1, failToPass: 0, unchanged: 0, needsInformationChanged: 0, otherChanged: 0 },
        changed: [{ buildSheetId: sheetId, sheetName: 'Full cage 2027', carName: 'Grey Saloon', builder: { id: expect.any(String), displayName: expect.any(String) }, classId: 'club-saloon', before: 'pass', after: 'fail' }],
      },
    });
    // Nothing was stored or sent: an impact is a preview.
    expect(await db.ds.query(`SELECT 1 FROM ruleset_recheck_results`)).toEqual([]);
    await who.admin.agent.delete(`/api/ruleset-drafts/${draft.id}`).set('X-CSRF-Token', who.admin.token).expect(204);
  });

  it('fails at once, with the reason and no retries, when the draft is gone before the job runs', async () => {
    // A queue of its own that no worker serves yet, so the draft can be deleted before the job starts.
    const idle = createJobs(testConfig(), createLogger('silent'), { pollingIntervalSeconds: 0.5, schema: 'pgboss_impact_gone' });
    await idle.start();
    try {
      const quiet = makeTestApp(db.ds, { services, republishQueue: idle, jobControl: idle });
      const admin = (await everyone(quiet)).admin;
      const draft = await stricterDraft();
      const started = await admin.agent.post(`/api/ruleset-drafts/${draft.id}/impact`).set('X-CSRF-Token', admin.token).expect(202);
      await admin.agent.delete(`/api/ruleset-drafts/${draft.id}`).set('X-CSRF-Token', admin.token).expect(204);
      await registerImpactWorker(idle, { rulebookAdmin: services.rulebookAdmin });
      const job = await settled(admin, started.body.job.id);
      expect(job).toMatchObject({ state: 'failed', attempts: 1, error: 'The draft was deleted before its impact was worked out.', result: null });
    } finally {
      await idle.stop();
    }
  });
});

describe('bulk re-checks in their own worker threads', () => {
  it('answer a builder’s checks during a publish re-check of 401 sheets: never checks_busy', async () => {
    await registerRepublishWorker(jobs, { ds: db.ds, evaluator: services.checks.bulk, mail: services.mail, audit: services.audit, publicUrl: testPublicUrl, batchSize: 50 });
    await manySheets(400);
    const draft = await stricterDraft();
    const pub = await post(who.admin, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: draft.lockVersion, effectiveDate: '2028-01-01' }).expect(202);
    const jobId = pub.body.published.jobId as string;
    const dryRun = { rulesetVersionId: draft.id, classId: 'club-saloon', specification: passingSaloonSpec() };

    let bulkMaxInFlight = 0;
    let bulkThreadsSeen = 0;
    const watch = setInterval(() => {
      const s = services.checks.bulk.stats();
      bulkMaxInFlight = Math.max(bulkMaxInFlight, s.inFlight);
      bulkThreadsSeen = Math.max(bulkThreadsSeen, s.workers);
    }, 5);
    const statuses: number[] = [];
    let roundsWhileRunning = 0;
    try {
      for (;;) {
        const job = (await who.admin.agent.get(`/api/jobs/${jobId}`).expect(200)).body.job as JobProgressWire;
        if (job.state === 'completed' || job.state === 'failed') break;
        if (job.state !== 'running') continue;
        // As many checks at once as the interactive pool takes: each must be answered.
        const answers = await Promise.all(Array.from({ length: interactiveMaxInFlight }, () => post(who.builder, '/api/checks').send(dryRun)));
        statuses.push(...answers.map((a) => a.status));
        roundsWhileRunning++;
      }
    } finally {
      clearInterval(watch);
    }
    const job = await settled(who.admin, jobId);
    expect(job).toMatchObject({ state: 'completed', total: 401, done: 401, failed: 0 });
    expect(job.result).toEqual({ kind: 'recheck', checked: 401, failed: 0, changed: 401, mailed: 401 });
    expect(roundsWhileRunning).toBeGreaterThan(0);
    expect(statuses.filter((s) => s !== 200)).toEqual([]);
    // The bulk pool had a whole page in flight on every thread it was given: shared with the
    // interactive pool, it would have left no place for a builder's check.
    expect(bulkMaxInFlight).toBeGreaterThan(interactiveMaxInFlight);
    expect(bulkThreadsSeen).toBe(bulkThreads);
  }, 120_000);
});
