// Editions follow their effective dates (issue 13 §1): published ahead of its date an edition is
// scheduled and the one in force stays so; the edition clock brings it into force at midnight in the
// club's time zone (a club setting, admins only); the database refuses every other move; a sheet
// pinned to the older edition is told what it gets under the newer one and moves to it as a new
// revision in one action. The club's clock is fixed in this file (services' `now`).
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { newerEditionLines } from '../../backend/src/contracts/edition-words';
import { createServices, type Services } from '../../backend/src/services';
import { runRepublish } from '../../backend/src/services/publish/republish-job';
import { makeTestApp, testPublicUrl, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, type GarageFixture, type SignedIn } from './garage-fixtures';
import { passingSaloonSpec, withSaloonWall, type DocLike } from './rulebook-admin-fixtures';

const db = useTestDatabase();
let app: Express;
let services: Services;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;
/** 2 Dec 2026, midday in London (the demo club's zone: GMT in winter, so UTC+0). */
let clock = new Date('2026-12-02T12:00:00Z');

const post = (s: SignedIn, url: string) => s.agent.post(url).set('X-CSRF-Token', s.token);
const put = (s: SignedIn, url: string) => s.agent.put(url).set('X-CSRF-Token', s.token);
const patch = (s: SignedIn, url: string) => s.agent.patch(url).set('X-CSRF-Token', s.token);
const statusOf = async (id: string) => ((await db.ds.query(`SELECT status FROM ruleset_versions WHERE id = $1`, [id])) as { status: string }[])[0]!.status;

/** A draft whose saloon tube table asks 0.120 in walls (F-UNIT-1: 1 in = 25.4 mm), published on `date`. */
async function publishStricter(date: string) {
  const draft = (await post(who.admin, `/api/rulebooks/${fx.rulebookId}/drafts`).expect(201)).body.version as { id: string; lockVersion: number; document: DocLike };
  const saved = await put(who.admin, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: draft.lockVersion, document: withSaloonWall(draft.document, 0.12) }).expect(200);
  const res = await post(who.admin, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: saved.body.draft.lockVersion, effectiveDate: date });
  return { id: draft.id, lockVersion: saved.body.draft.lockVersion as number, res };
}

beforeAll(async () => {
  fx = await garageFixture(db.ds);
  services = createServices(db.ds, { publicUrl: testPublicUrl, now: () => clock });
  app = makeTestApp(db.ds, { services });
  who = await everyone(app);
}, 60_000);

describe('the club’s time zone', () => {
  it('is read by every member with the club’s date today, and changed by admins only (logged)', async () => {
    const read = await who.builder.agent.get(`/api/clubs/${fx.clubId}/settings`).expect(200);
    expect(read.body.settings).toEqual({ timeZone: 'Europe/London', today: '2026-12-02' });
    await who.outsider.agent.get(`/api/clubs/${fx.clubId}/settings`).expect(404);
    await patch(who.builder, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'UTC' }).expect(403);
    await patch(who.steward, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'UTC' }).expect(403);
    const bad = await patch(who.admin, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'Mars/Olympus_Mons' }).expect(400);
    expect(bad.body.error.details).toEqual([{ path: 'timeZone', message: expect.stringMatching(/Not a time zone name/) }]);
    await patch(who.admin, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'Europe/London', extra: 1 }).expect(400);
    // 2 Dec 2026 12:00 UTC is already 3 Dec 01:00 in Auckland (NZDT, UTC+13).
    const nz = await patch(who.admin, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'Pacific/Auckland' }).expect(200);
    expect(nz.body.settings).toEqual({ timeZone: 'Pacific/Auckland', today: '2026-12-03' });
    const back = await patch(who.admin, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'Europe/London' }).expect(200);
    expect(back.body.settings.today).toBe('2026-12-02');
    const log: { details: { timeZone: { from: string; to: string } } }[] = await db.ds.query(
      `SELECT details FROM audit_entries WHERE action = 'club.settings_changed' AND club_id = $1 ORDER BY created_at`,
      [fx.clubId],
    );
    expect(log.map((l) => l.details.timeZone)).toEqual([{ from: 'Europe/London', to: 'Pacific/Auckland' }, { from: 'Pacific/Auckland', to: 'Europe/London' }]);
  });
});

describe('an edition published ahead of its date', () => {
  let sheetId: string;
  let next: { id: string };

  it('is scheduled, and the edition in force stays in force', async () => {
    ({ sheetId } = await carWithSheet(who.builder, fx, passingSaloonSpec()));
    expect((await post(who.builder, `/api/build-sheets/${sheetId}/check-runs`).expect(201)).body.checkRun.overallVerdict).toBe('pass');
    const published = await publishStricter('2027-01-01');
    expect(published.res.status, JSON.stringify(published.res.body)).toBe(202);
    expect(published.res.body.published).toMatchObject({ versionId: published.id, status: 'scheduled', effectiveDate: '2027-01-01', classIds: ['club-saloon'] });
    next = published;
    expect(await statusOf(next.id)).toBe('scheduled');
    expect(await statusOf(fx.versionId)).toBe('published');
    const listed = await who.builder.agent.get(`/api/clubs/${fx.clubId}/rulebooks`).expect(200);
    const cage = listed.body.rulebooks.find((b: { id: string }) => b.id === fx.rulebookId);
    expect(cage.versions.map((v: { versionNumber: number; status: string; effectiveDate: string }) => [v.versionNumber, v.status, v.effectiveDate]))
      .toEqual([[2, 'scheduled', '2027-01-01'], [1, 'published', '2026-11-01']]);
    const log: { action: string; details: { supersededVersion: number | null } }[] = await db.ds.query(
      `SELECT action, details FROM audit_entries WHERE entity_id = $1 AND action LIKE 'ruleset.%' AND action <> 'ruleset.draft_saved' ORDER BY created_at`,
      [next.id],
    );
    expect(log.map((l) => [l.action, l.details.supersededVersion ?? null])).toEqual([['ruleset.draft_started', null], ['ruleset.scheduled', null]]);
  });

  it('refuses a later draft dated before it, with the reason the publish form shows too', async () => {
    const early = await publishStricter('2026-12-20');
    expect(early.res.status).toBe(409);
    expect(early.res.body.error.message).toBe('The effective date 20 Dec 2026 is before 1 Jan 2027, when the scheduled version 2 takes effect. Choose 1 Jan 2027 or later.');
    expect(await statusOf(early.id)).toBe('draft');
    await who.admin.agent.delete(`/api/ruleset-drafts/${early.id}`).set('X-CSRF-Token', who.admin.token).expect(204);
  });

  it('can be checked against ahead of its date', async () => {
    const { sheetId: other } = await carWithSheet(who.builder, fx, passingSaloonSpec());
    const res = await put(who.builder, `/api/build-sheets/${other}/specification`).send({ baseRevision: 1, rulesetVersionId: next.id, classId: 'club-saloon', specification: passingSaloonSpec() });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    // 1.750 × 0.095 in hoops under a 0.120 in table minimum: does not meet it (F-SCCA-T3 lists 0.095 at 1.750; the stricter draft is ours).
    expect((await post(who.builder, `/api/build-sheets/${other}/check-runs`).expect(201)).body.checkRun.overallVerdict).toBe('fail');
    await post(who.builder, `/api/build-sheets/${other}/archive`).expect(200);
  });

  it('tells the pinned sheet which edition is newer, from when, and what the sheet gets under it', async () => {
    const res = await who.builder.agent.get(`/api/build-sheets/${sheetId}/editions`).expect(200);
    const e = res.body.editions;
    expect(e.pinned).toMatchObject({ versionId: fx.versionId, versionNumber: 1, edition: '2027', status: 'published', effectiveDate: '2026-11-01' });
    expect(e.inForce).toBeNull();
    expect(e.newer).toMatchObject({ versionId: next.id, versionNumber: 2, edition: '2028', status: 'scheduled', effectiveDate: '2027-01-01', verdictNow: 'pass', verdictUnder: 'fail', classExists: true, className: 'Club Saloon (full cage)' });
    expect(e.newer.changes.join('\n')).toMatch(/0\.095 → 0\.120 in/);
    expect(e.newer.newFindings.length).toBeGreaterThan(0);
    expect(e.newer.newFindings[0]).toMatchObject({ verdict: 'fail', section: expect.any(String), subject: expect.stringMatching(/main hoop mh|front hoop fh|rear brace/) });
    // The re-check at publishing mails the builder the same sentences the sheet's banner shows.
    await runRepublish(
      { ds: db.ds, evaluator: services.checks.bulk, mail: services.mail, audit: services.audit, publicUrl: testPublicUrl },
      { id: randomUUID(), data: { versionId: next.id, previousVersionId: fx.versionId, classIds: ['club-saloon'] }, progress: { setTotal: async () => undefined, advance: async () => undefined } },
    );
    const [mail] = await db.ds.query(`SELECT text_body FROM outbox_messages WHERE kind = 'verdict.changed' AND related->>'buildSheetId' = $1`, [sheetId]);
    const lines = newerEditionLines({
      rulebookTitle: e.rulebookTitle, pinnedEdition: e.pinned.edition, newerEdition: e.newer.edition, newerStatus: e.newer.status,
      effectiveDate: e.newer.effectiveDate, verdictNow: e.newer.verdictNow, verdictUnder: e.newer.verdictUnder, className: e.newer.className,
    });
    expect(lines.headline).toBe('Tarnwick Vale MC Cage Regulations, edition 2028, applies from 1 Jan 2027. It is not in force yet.');
    for (const line of [lines.headline, lines.pinned, lines.verdicts, lines.action]) expect(mail.text_body).toContain(line);
    expect(mail.text_body).toContain(`${testPublicUrl}/build-sheets/${sheetId}`);
    // The club's stewards read it too; strangers do not learn the sheet exists.
    await who.steward.agent.get(`/api/build-sheets/${sheetId}/editions`).expect(200);
    await who.otherBuilder.agent.get(`/api/build-sheets/${sheetId}/editions`).expect(404);
  });

  it('moves the sheet to the newer edition as a new revision; earlier revisions keep theirs', async () => {
    await post(who.steward, `/api/build-sheets/${sheetId}/move-edition`).send({ baseRevision: 1, rulesetVersionId: next.id }).expect(403);
    await post(who.otherBuilder, `/api/build-sheets/${sheetId}/move-edition`).send({ baseRevision: 1, rulesetVersionId: next.id }).expect(404);
    const bad = await post(who.builder, `/api/build-sheets/${sheetId}/move-edition`).send({ baseRevision: 'one', rulesetVersionId: 'x' }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['baseRevision', 'rulesetVersionId']);
    const stale = await post(who.builder, `/api/build-sheets/${sheetId}/move-edition`).send({ baseRevision: 7, rulesetVersionId: next.id }).expect(409);
    expect(stale.body.error.details).toEqual({ currentRevision: 1 });
    const same = await post(who.builder, `/api/build-sheets/${sheetId}/move-edition`).send({ baseRevision: 1, rulesetVersionId: fx.versionId }).expect(409);
    expect(same.body.error.message).toMatch(/not newer than edition 2027/);

    const moved = await post(who.builder, `/api/build-sheets/${sheetId}/move-edition`).send({ baseRevision: 1, rulesetVersionId: next.id }).expect(200);
    expect(moved.body.buildSheet).toMatchObject({ rulesetVersionId: next.id, currentRevision: 2, rulebook: { edition: '2028' } });
    expect(moved.body.revision).toMatchObject({ number: 2, rulesetVersionId: next.id, classId: 'club-saloon' });
    const r1 = await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions/1`).expect(200);
    expect(r1.body.revision.rulesetVersionId).toBe(fx.versionId);
    expect(moved.body.revision.specification).toEqual(r1.body.revision.specification);
    const diff = await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions/1/diff/2`).expect(200);
    expect(diff.body.changes.map((c: { text: string }) => c.text)).toEqual(['build sheet: checked against another ruleset version']);
    expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}/editions`).expect(200)).body.editions.newer).toBeNull();
  });

  it('comes into force at midnight in the club’s time zone, once, with the one before superseded', async () => {
    // 31 Dec 2026 23:30 in London (UTC+0 in winter): not yet.
    expect(await services.rulebookAdmin.activateDueEditions(new Date('2026-12-31T23:30:00Z'))).toEqual([]);
    expect(await statusOf(next.id)).toBe('scheduled');
    // The same instant is already 1 Jan 2027 12:30 in Auckland: a club there has its edition in force.
    await patch(who.admin, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'Pacific/Auckland' }).expect(200);
    const done = await services.rulebookAdmin.activateDueEditions(new Date('2026-12-31T23:30:00Z'));
    expect(done).toEqual([{ versionId: next.id, rulebookId: fx.rulebookId, versionNumber: 2, supersededIds: [fx.versionId] }]);
    expect([await statusOf(next.id), await statusOf(fx.versionId)]).toEqual(['published', 'superseded']);
    expect(await services.rulebookAdmin.activateDueEditions(new Date('2027-01-02T00:00:00Z'))).toEqual([]);
    const log: { actor_id: string | null; details: { supersededVersions: number[] } }[] = await db.ds.query(
      `SELECT actor_id, details FROM audit_entries WHERE action = 'ruleset.in_force' AND entity_id = $1`,
      [next.id],
    );
    expect(log).toEqual([{ actor_id: null, details: expect.objectContaining({ versionNumber: 2, effectiveDate: '2027-01-01', supersededVersions: [1] }) }]);
    await patch(who.admin, `/api/clubs/${fx.clubId}/settings`).send({ timeZone: 'Europe/London' }).expect(200);
  });

  it('is in force at once when dated today in the club', async () => {
    clock = new Date('2027-01-10T09:00:00Z');
    const today = await publishStricter('2027-01-10');
    expect(today.res.status, JSON.stringify(today.res.body)).toBe(202);
    expect(today.res.body.published.status).toBe('published');
    expect([await statusOf(today.id), await statusOf(next.id)]).toEqual(['published', 'superseded']);
  });
});

describe('the database guards the edition states', () => {
  const attempt = async (sql: string, params: unknown[]) => {
    try {
      await db.ds.query(sql, params);
      return 'done';
    } catch (err) {
      return (err as { code?: string }).code;
    }
  };

  it('allows draft → scheduled → published and refuses going back, or changing a scheduled edition', async () => {
    const [row] = await db.ds.query(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document)
       SELECT rulebook_id, 40, 'draft', '2040', '2040-01-01', document FROM ruleset_versions WHERE id = $1 RETURNING id`,
      [fx.versionId],
    );
    const id = row.id as string;
    expect(await attempt(`UPDATE ruleset_versions SET status = 'scheduled', published_at = now() WHERE id = $1`, [id])).toBe('done');
    expect(await attempt(`UPDATE ruleset_versions SET edition = 'changed' WHERE id = $1`, [id])).toBe('CW001');
    expect(await attempt(`UPDATE ruleset_versions SET status = 'draft' WHERE id = $1`, [id])).toBe('CW001');
    expect(await attempt(`DELETE FROM ruleset_versions WHERE id = $1`, [id])).toBe('CW001');
    expect(await attempt(`UPDATE ruleset_versions SET status = 'retired' WHERE id = $1`, [id])).toBe('done');
    expect(await attempt(`UPDATE ruleset_versions SET status = 'scheduled' WHERE id = $1`, [id])).toBe('CW001');
    // A version in force or replaced never becomes scheduled again.
    expect(await attempt(`UPDATE ruleset_versions SET status = 'scheduled' WHERE id = $1`, [fx.versionId])).toBe('CW001');
  });
});
