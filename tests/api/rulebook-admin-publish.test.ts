// The publish job end to end, on pg-boss and the outbox: an admin raises the saloon tube table's
// walls and publishes; the job re-checks the active saloon sheets, records pass → fail for the
// builder's sheet, and puts a mail into the outbox. With the SMTP server down the job still
// completes; the mail waits and reaches the fake mailbox (dev_mailbox) once the server is back.
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobProgressWire } from '../../backend/src/contracts/jobs';
import { startFakeSmtp, type FakeSmtp } from '../../backend/src/dev/fake-smtp';
import { createLogger } from '../../backend/src/logger';
import { createServices } from '../../backend/src/services';
import { createJobs, type Jobs } from '../../backend/src/services/jobs';
import { createMailboxService, createSmtpTransport, safetyCaution, startOutboxDispatcher } from '../../backend/src/services/mail';
import { registerRepublishWorker } from '../../backend/src/services/publish/republish-job';
import { makeTestApp, testConfig, testPublicUrl, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, type GarageFixture, type SignedIn } from './garage-fixtures';
import { clearMailTables, freePort, mailboxRows, outboxRows } from './mail-helpers';
import { passingSaloonSpec, withSaloonWall, type DocLike } from './rulebook-admin-fixtures';

const db = useTestDatabase();
let jobs: Jobs;
let app: Express;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;
let smtp: FakeSmtp | null = null;

beforeAll(async () => {
  fx = await garageFixture(db.ds);
  // The club's clock stands in December 2026: an edition dated 1 January 2028 is scheduled.
  const services = createServices(db.ds, { publicUrl: testPublicUrl, now: () => new Date('2026-12-02T12:00:00Z') });
  jobs = createJobs(testConfig(), createLogger('silent'), { pollingIntervalSeconds: 0.5 });
  await jobs.start();
  await registerRepublishWorker(jobs, { ds: db.ds, evaluator: services.checks.bulk, mail: services.mail, audit: services.audit, publicUrl: testPublicUrl });
  app = makeTestApp(db.ds, { services, republishQueue: jobs });
  who = await everyone(app);
  await clearMailTables(db.ds);
}, 60_000);

afterAll(async () => {
  await jobs?.stop();
  await smtp?.stop();
});

const post = (s: SignedIn, url: string) => s.agent.post(url).set('X-CSRF-Token', s.token);

async function settled(admin: SignedIn, jobId: string): Promise<JobProgressWire> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const res = await admin.agent.get(`/api/jobs/${jobId}`).expect(200);
    const job = res.body.job as JobProgressWire;
    if (job.state === 'completed' || job.state === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`job still ${job.state}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe('publishing re-checks the sheets and tells the builders', () => {
  it('records pass → fail, mails the builder, and the mail waits out an SMTP outage', async () => {
    const { sheetId } = await carWithSheet(who.builder, fx, passingSaloonSpec());
    const run = await post(who.builder, `/api/build-sheets/${sheetId}/check-runs`).expect(201);
    expect(run.body.checkRun.overallVerdict).toBe('pass');
    // A second sheet in another class is not re-checked: the change concerns club-saloon only.
    const sprint = { ...passingSaloonSpec(), vehicle: { classId: 'open-sprint', weightWithoutDriverKg: 700, chassis: 'unibody', cockpit: 'open' } };
    const car = await post(who.builder, '/api/cars').send({ name: 'Blue Sprinter', chassisType: 'unibody' }).expect(201);
    await post(who.builder, `/api/cars/${car.body.car.id}/build-sheets`).send({ name: 'Roll bar', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'open-sprint', specification: sprint }).expect(201);

    const draft = (await post(who.admin, `/api/rulebooks/${fx.rulebookId}/drafts`).expect(201)).body.version as { id: string; lockVersion: number; document: DocLike };
    // 0.120 in walls for the saloon table (the demo rulebook is imperial; F-UNIT-1: 1 in = 25.4 mm).
    const saved = await who.admin.agent.put(`/api/ruleset-drafts/${draft.id}`).set('X-CSRF-Token', who.admin.token)
      .send({ lockVersion: draft.lockVersion, document: withSaloonWall(draft.document, 0.12) }).expect(200);

    const pub = await post(who.admin, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: saved.body.draft.lockVersion, effectiveDate: '2028-01-01' }).expect(202);
    const jobId = pub.body.published.jobId as string;
    expect(jobId).toMatch(/^[0-9a-f-]{36}$/);
    // Progress is the admin's to read; the builder is refused.
    await who.builder.agent.get(`/api/jobs/${jobId}`).expect(403);
    const job = await settled(who.admin, jobId);
    expect(job).toMatchObject({ state: 'completed', total: 1, done: 1, failed: 0, error: null });

    const results: { build_sheet_id: string; verdict_before: string; verdict_after: string; mail_id: string | null }[] = await db.ds.query(
      `SELECT build_sheet_id, verdict_before, verdict_after, mail_id FROM ruleset_recheck_results WHERE job_id = $1`,
      [jobId],
    );
    expect(results).toEqual([{ build_sheet_id: sheetId, verdict_before: 'pass', verdict_after: 'fail', mail_id: expect.any(String) }]);

    // The SMTP server is down: the mail waits in the outbox.
    const port = await freePort();
    const clock = { t: Date.now() };
    const dispatcher = startOutboxDispatcher({ dataSource: db.ds, transport: createSmtpTransport(`smtp://127.0.0.1:${port}`), from: 'Cagewright <no-reply@cagewright.example>', logger: createLogger('silent'), autoStart: false, now: () => new Date(clock.t) });
    try {
      expect(await dispatcher.runOnce()).toEqual({ sent: 0, retried: 1, gaveUp: 0 });
      expect((await outboxRows(db.ds)).map((r) => [r.to_address, r.status])).toEqual([['builder@tarnwick.example', 'pending']]);
      expect(await mailboxRows(db.ds)).toEqual([]);

      smtp = await startFakeSmtp({ store: createMailboxService(db.ds).store, port });
      clock.t += 30_000;
      expect(await dispatcher.runOnce()).toEqual({ sent: 1, retried: 0, gaveUp: 0 });
    } finally {
      await dispatcher.stop();
    }
    const [mail, ...others] = await mailboxRows(db.ds);
    expect(others).toEqual([]);
    expect(mail!.to_address).toBe('builder@tarnwick.example');
    expect(mail!.subject).toMatch(/2028: new pre-check verdict for Grey Saloon/);
    // The same sentences as the build sheet's banner the mail links to (contracts/edition-words.ts).
    expect(mail!.text_body).toContain('Tarnwick Vale MC Cage Regulations, edition 2028, applies from 1 Jan 2028. It is not in force yet.');
    expect(mail!.text_body).toContain('This build sheet is checked against edition 2027 and stays on it until you move it.');
    expect(mail!.text_body).toContain('Under edition 2027 it meets the rules; from 1 Jan 2028, under edition 2028, it does not meet the rules.');
    expect(mail!.text_body).toMatch(/0\.095 → 0\.120 in/);
    expect(mail!.text_body).toContain(`Open the build sheet: ${testPublicUrl}/build-sheets/${sheetId}`);
    expect(mail!.text_body).toContain(safetyCaution);

    const log: { action: string; details: { checked: number; mailed: number } }[] = await db.ds.query(`SELECT action, details FROM audit_entries WHERE action = 'ruleset.recheck_completed' AND details->>'jobId' = $1`,
      [jobId],
    );
    // One completion entry for this job. (The activity log is append-only and outlives the per-file
    // reset: earlier files' publish jobs have entries of their own.)
    expect(log).toHaveLength(1);
    expect(log[0]!.details).toMatchObject({ checked: 1, mailed: 1 });
  });
});
