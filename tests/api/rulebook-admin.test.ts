// Rulebook administration over HTTP: drafts (start, autosave with lock versions, import, delete),
// compare, impact (refusals; the job itself: impact-job.test.ts), publish, retire and export; every refused role (builder and steward 403, a
// stranger 404); a published version refuses changes at the API and in the database itself.
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { createServices } from '../../backend/src/services';
import { makeTestApp, testPublicUrl, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, type GarageFixture, type SignedIn } from './garage-fixtures';
import { passingSaloonSpec, withSaloonWall, type DocLike } from './rulebook-admin-fixtures';

const db = useTestDatabase();
let app: Express;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;
// The activity log is not reset between files (it is append-only); this file reads only its own entries.
let startedAt: Date;

beforeAll(async () => {
  startedAt = new Date();
  fx = await garageFixture(db.ds);
  // The club's clock stands in February 2028, so an edition dated 1 January 2028 is in force when published.
  app = makeTestApp(db.ds, { services: createServices(db.ds, { publicUrl: testPublicUrl, now: () => new Date('2028-02-01T12:00:00Z') }) });
  who = await everyone(app);
}, 60_000);

const post = (s: SignedIn, url: string) => s.agent.post(url).set('X-CSRF-Token', s.token);
const put = (s: SignedIn, url: string) => s.agent.put(url).set('X-CSRF-Token', s.token);
const del = (s: SignedIn, url: string) => s.agent.delete(url).set('X-CSRF-Token', s.token);

type Doc = DocLike;

async function newDraft(): Promise<{ id: string; lockVersion: number; document: Doc }> {
  const res = await post(who.admin, `/api/rulebooks/${fx.rulebookId}/drafts`).expect(201);
  return res.body.version;
}

describe('rulebook administration', () => {
  it('refuses builders and stewards (403) and strangers (404) on every route', async () => {
    const draft = await newDraft();
    const routes: [string, (s: SignedIn) => ReturnType<typeof post>][] = [
      ['start a draft', (s) => post(s, `/api/rulebooks/${fx.rulebookId}/drafts`)],
      ['save', (s) => put(s, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: draft.lockVersion, document: draft.document })],
      ['import', (s) => post(s, `/api/ruleset-drafts/${draft.id}/import`).send({ lockVersion: draft.lockVersion, text: JSON.stringify(draft.document) })],
      ['impact', (s) => post(s, `/api/ruleset-drafts/${draft.id}/impact`)],
      ['publish', (s) => post(s, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: draft.lockVersion, effectiveDate: '2028-01-01' })],
      ['retire', (s) => post(s, `/api/ruleset-versions/${fx.versionId}/retire`)],
      ['compare', (s) => s.agent.get(`/api/ruleset-versions/${fx.versionId}/compare/${fx.versionId}`)],
      ['export', (s) => s.agent.get(`/api/ruleset-versions/${fx.versionId}/export`)],
      ['delete', (s) => del(s, `/api/ruleset-drafts/${draft.id}`)],
    ];
    for (const [name, call] of routes) {
      // Drafts are invisible to non-admins, so the draft routes answer 404 to them; published ones 403.
      const onDraft = !['start a draft', 'retire', 'compare', 'export'].includes(name);
      const b = await call(who.builder);
      expect([name, b.status]).toEqual([name, onDraft ? 404 : 403]);
      const s = await call(who.steward);
      expect([name, s.status]).toEqual([name, onDraft ? 404 : 403]);
      const o = await call(who.outsider);
      expect([name, o.status]).toEqual([name, 404]);
    }
    // Nothing happened: the draft is as it was and still the only one.
    const v = await who.admin.agent.get(`/api/ruleset-versions/${draft.id}`).expect(200);
    expect(v.body.version.lockVersion).toBe(draft.lockVersion);
    await del(who.admin, `/api/ruleset-drafts/${draft.id}`).expect(204);
  });

  it('starts one draft as a copy of the latest edition; a second is refused', async () => {
    const draft = await newDraft();
    expect(draft).toMatchObject({ status: 'draft', versionNumber: 2, edition: '2028' });
    expect(draft.document.rulebook.edition).toBe('2028');
    const again = await post(who.admin, `/api/rulebooks/${fx.rulebookId}/drafts`).expect(409);
    expect(again.body.error.message).toMatch(/already a draft/);
    const list = await who.admin.agent.get(`/api/clubs/${fx.clubId}/rulebooks`).expect(200);
    const book = list.body.rulebooks.find((b: { id: string }) => b.id === fx.rulebookId);
    expect(book.versions.map((v: { status: string }) => v.status)).toEqual(['draft', 'published']);
    await del(who.admin, `/api/ruleset-drafts/${draft.id}`).expect(204);
    await who.admin.agent.get(`/api/ruleset-versions/${draft.id}`).expect(404);
  });

  it('autosaves with problems listed by path; a stale save gets 409 with both versions kept', async () => {
    const draft = await newDraft();
    const broken = structuredClone(draft.document) as Doc & { requirements: { section?: string }[] };
    delete broken.requirements[0]!.section;
    const first = await put(who.admin, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: draft.lockVersion, document: broken }).expect(200);
    expect(first.body.draft.lockVersion).toBe(draft.lockVersion + 1);
    expect(first.body.draft.problems).toContainEqual(expect.objectContaining({ path: 'requirements.0.section' }));

    // A second admin (the same account in another session) still holds the old lock version.
    const stale = withSaloonWall(draft.document, 0.12);
    const second = await put(who.admin, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: draft.lockVersion, document: stale }).expect(409);
    expect(second.body.error.code).toBe('conflict');
    expect(second.body.error.details.currentLockVersion).toBe(draft.lockVersion + 1);
    expect(second.body.error.details.currentDocument.requirements[0].section).toBeUndefined();
    const stored = await who.admin.agent.get(`/api/ruleset-versions/${draft.id}`).expect(200);
    expect(stored.body.version.document.requirements[0].section).toBeUndefined();
    await del(who.admin, `/api/ruleset-drafts/${draft.id}`).expect(204);
  });

  it('lists each new form\'s bad input at its path (issue 9 "Bad input") and refuses to put such a draft in force', async () => {
    const draft = await newDraft();
    const doc = structuredClone(draft.document) as Doc & { requirements: unknown[] };
    const n = doc.requirements.length;
    const rule = (id: string, scope: unknown, requires: unknown) => ({ id, title: id, section: `X${id.length}`, severity: 'mandatory', area: 'mounting', scope, requires, explanation: '' });
    doc.requirements.push(
      // k × a fact of another dimension: a side as k × an area.
      rule('bad-k', { kind: 'plate', locations: ['main_hoop_foot'] }, { template: 'limit', checks: [{ fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, of: 'plate.areaMm2' } }] }),
      rule('bad-grade', { kind: 'member', memberKinds: ['main_hoop'] }, { template: 'limit', checks: [{ fact: 'member.grade', operator: 'atLeast', value: 'Grade 9000' }] }),
      rule('bad-tolerance', { kind: 'member', memberKinds: ['main_hoop'] }, { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 1.5, wall: 0.12 }] }] }], measuredWall: { method: 'ultrasonic', tolerance: { percent: 50 } } }),
      rule('bad-side', { kind: 'vehicle' }, { template: 'required_members', members: [{ kinds: ['main_hoop'], min: 1, side: 'each' }] }),
    );
    const saved = await put(who.admin, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: draft.lockVersion, document: doc }).expect(200);
    const paths = saved.body.draft.problems.map((p: { path: string }) => p.path);
    expect(paths).toEqual(expect.arrayContaining([
      `requirements.${n}.requires.checks.0.value.of`,
      `requirements.${n + 1}.requires.checks.0.value`,
      `requirements.${n + 2}.requires.measuredWall.tolerance.percent`,
      `requirements.${n + 3}.requires.members.0.side`,
    ]));
    expect(paths).toHaveLength(4);
    const refused = await post(who.admin, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: saved.body.draft.lockVersion, effectiveDate: '2028-01-01' }).expect(409);
    expect(refused.body.error.details.problems.map((p: { path: string }) => p.path)).toEqual(paths);
    await del(who.admin, `/api/ruleset-drafts/${draft.id}`).expect(204);
  });

  it('imports a document; bad JSON and a bad schema give 400 with paths and leave the draft untouched', async () => {
    const draft = await newDraft();
    const badJson = await post(who.admin, `/api/ruleset-drafts/${draft.id}/import`).send({ lockVersion: draft.lockVersion, text: '{"formatVersion": 1,' }).expect(400);
    expect(badJson.body.error.details[0]).toMatchObject({ path: 'text', message: expect.stringMatching(/not valid JSON/) });
    const schemaBad = { ...draft.document, classes: [{ id: 'x' }] };
    const badSchema = await post(who.admin, `/api/ruleset-drafts/${draft.id}/import`).send({ lockVersion: draft.lockVersion, text: JSON.stringify(schemaBad) }).expect(400);
    expect(badSchema.body.error.details.map((d: { path: string }) => d.path)).toContain('document.classes.0.name');
    const after = await who.admin.agent.get(`/api/ruleset-versions/${draft.id}`).expect(200);
    expect(after.body.version.lockVersion).toBe(draft.lockVersion);
    expect(after.body.version.document).toEqual(draft.document);

    const good = withSaloonWall(draft.document, 0.12);
    const ok = await post(who.admin, `/api/ruleset-drafts/${draft.id}/import`).send({ lockVersion: draft.lockVersion, text: JSON.stringify(good) }).expect(200);
    expect(ok.body.draft.problems).toEqual([]);
    const compare = await who.admin.agent.get(`/api/ruleset-versions/${draft.id}/compare/${fx.versionId}`).expect(200);
    expect(compare.body.from).toBe(1);
    expect(compare.body.to).toBe(2);
    expect(compare.body.changes.map((c: { text: string }) => c.text).join('\n')).toMatch(/0\.095 → 0\.120 in/);
    await del(who.admin, `/api/ruleset-drafts/${draft.id}`).expect(204);
  });

  it('publishes, refuses changes to the published version (API and database), retires', async () => {
    const { sheetId } = await carWithSheet(who.builder, fx, passingSaloonSpec());
    const run = await post(who.builder, `/api/build-sheets/${sheetId}/check-runs`).expect(201);
    expect(run.body.checkRun.report.measureNext.map((m: { fact: string; memberIds: string[] }) => m.fact + ':' + m.memberIds.join(','))).toEqual([]);
    expect(run.body.checkRun.overallVerdict).toBe('pass');
    const draft = await newDraft();
    const doc = withSaloonWall(draft.document, 0.12);
    const saved = await put(who.admin, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: draft.lockVersion, document: doc }).expect(200);
    // The impact is a background job (tests/api/impact-job.test.ts); this app runs none, and says so.
    const impact = await post(who.admin, `/api/ruleset-drafts/${draft.id}/impact`).expect(409);
    expect(impact.body.error.message).toBe('Background jobs are not running on this server, so the impact cannot be worked out.');

    const noDate = await post(who.admin, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: saved.body.draft.lockVersion }).expect(400);
    expect(noDate.body.error.details[0].path).toBe('effectiveDate');
    const pub = await post(who.admin, `/api/ruleset-drafts/${draft.id}/publish`).send({ lockVersion: saved.body.draft.lockVersion, effectiveDate: '2028-01-01' }).expect(202);
    expect(pub.body.published).toMatchObject({ versionId: draft.id, jobId: null, classIds: ['club-saloon'], status: 'published', effectiveDate: '2028-01-01' });
    const v = await who.builder.agent.get(`/api/ruleset-versions/${draft.id}`).expect(200);
    expect(v.body.version).toMatchObject({ status: 'published', effectiveDate: '2028-01-01' });
    const old = await who.builder.agent.get(`/api/ruleset-versions/${fx.versionId}`).expect(200);
    expect(old.body.version.status).toBe('superseded');

    // The API refuses to save, import or delete the published version.
    const lock = v.body.version.lockVersion;
    const save = await put(who.admin, `/api/ruleset-drafts/${draft.id}`).send({ lockVersion: lock, document: draft.document }).expect(409);
    expect(save.body.error.message).toMatch(/can never change/);
    await post(who.admin, `/api/ruleset-drafts/${draft.id}/import`).send({ lockVersion: lock, text: JSON.stringify(draft.document) }).expect(409);
    await del(who.admin, `/api/ruleset-drafts/${draft.id}`).expect(409);
    // The database refuses it too, whoever writes (SQLSTATE CW001 from the trigger).
    await expect(db.ds.query(`UPDATE ruleset_versions SET document = '{}'::jsonb WHERE id = $1`, [draft.id])).rejects.toMatchObject({ code: 'CW001' });
    await expect(db.ds.query(`UPDATE ruleset_versions SET edition = 'x' WHERE id = $1`, [draft.id])).rejects.toMatchObject({ code: 'CW001' });
    await expect(db.ds.query(`DELETE FROM ruleset_versions WHERE id = $1`, [draft.id])).rejects.toMatchObject({ code: 'CW001' });

    const exp = await who.admin.agent.get(`/api/ruleset-versions/${draft.id}/export`).expect(200);
    expect(exp.headers['content-disposition']).toMatch(/attachment; filename="tarnwick-vale-mc-cage-regulations-2027-2028\.json"/);
    expect(JSON.parse(exp.text).rulebook).toMatchObject({ edition: '2028', effectiveDate: '2028-01-01' });

    const retired = await post(who.admin, `/api/ruleset-versions/${fx.versionId}/retire`).expect(200);
    expect(retired.body.version.status).toBe('retired');
    await post(who.admin, `/api/ruleset-versions/${fx.versionId}/retire`).expect(409);

    const log: { action: string }[] = await db.ds.query(`SELECT action FROM audit_entries WHERE entity_type = 'ruleset_version' AND created_at >= $1 ORDER BY created_at`, [startedAt]);
    expect(new Set(log.map((l) => l.action))).toEqual(new Set(['ruleset.draft_started', 'ruleset.draft_saved', 'ruleset.draft_deleted', 'ruleset.imported', 'ruleset.published', 'ruleset.retired']));
  });

  it('answers 400 for malformed ids and 404 for unknown ones', async () => {
    const bad = await post(who.admin, '/api/ruleset-drafts/nope/impact').expect(400);
    expect(bad.body.error.details[0].path).toBe('params.versionId');
    await post(who.admin, '/api/ruleset-drafts/00000000-0000-4000-8000-000000000000/impact').expect(404);
    await post(who.admin, '/api/rulebooks/00000000-0000-4000-8000-000000000000/drafts').expect(404);
  });
});
