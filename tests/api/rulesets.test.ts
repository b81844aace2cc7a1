// Rulebooks and ruleset versions: the demo seed (validated, insert-if-missing), who may list and
// read them (docs/api.md, "Rulesets and checks"), drafts for admins only, and the database rule
// that a version which left the draft state never changes its content.
import { mkdtemp, rm, writeFile, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../backend/src/db/seed';
import { loadDemoRulesets, rulesetSeedStep, seedDemoRulesets } from '../../backend/src/db/seed-rulesets';
import { validateRulesetDocument } from '../../backend/src/domain';
import { hashPassword } from '../../backend/src/services/passwords';
import { agentFor, demo, demoClubId, hasErrorBody, makeTestApp, signIn, useTestDatabase } from './helpers';

const db = useTestDatabase();
const versionNotFound = { error: { code: 'not_found', message: 'Ruleset version not found.' } };
const clubNotFound = { error: { code: 'not_found', message: 'Club not found.' } };
const unauthenticated = { error: { code: 'unauthenticated', message: 'Please sign in.' } };
const cageFile = 'tarnwick-vale-mc-cage-regulations-2027';
const hillFile = 'tarnwick-vale-mc-hillclimb-2027-metric';
const isoTime = expect.stringMatching(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);

let app: ReturnType<typeof makeTestApp>;
let clubId: string;
let outsider: string;

async function versionIdOf(slug: string, versionNumber = 1): Promise<string> {
  const rows: { id: string }[] = await db.ds.query(
    `SELECT v.id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.slug = $1 AND v.version_number = $2`,
    [slug, versionNumber],
  );
  return rows[0]!.id;
}

async function fileDocument(name: string) {
  const v = validateRulesetDocument(JSON.parse(await readFile(join('rulesets', `${name}.json`), 'utf8')));
  if (!v.ok) throw new Error(`${name} does not validate`);
  return v.document;
}

/** The demo club's context, as the seed's steps receive it. */
async function seedContext() {
  const club = (await db.ds.query(`SELECT * FROM clubs WHERE slug = 'tarnwick-vale'`))[0];
  const users: { id: string; email: string }[] = await db.ds.query('SELECT id, email FROM users');
  return { club, usersByEmail: new Map(users.map((u) => [u.email, u])) } as never;
}

beforeAll(async () => {
  app = makeTestApp(db.ds);
  clubId = await demoClubId(db.ds);
  // Someone from another club, who must not learn that Tarnwick Vale's rulebooks exist.
  const club: { id: string }[] = await db.ds.query(`INSERT INTO clubs (slug, name) VALUES ('harrowgate-sprint', 'Harrowgate Sprint Club') RETURNING id`);
  const u: { id: string }[] = await db.ds.query(
    `INSERT INTO users (email, display_name, password_hash) VALUES ('admin@harrowgate.example', 'Ola Brent', $1) RETURNING id`,
    [await hashPassword('other-admin-password')],
  );
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{builder,steward,admin}')`, [u[0]!.id, club[0]!.id]);
  outsider = 'admin@harrowgate.example';
});

describe('the demo rulebook seed', () => {
  it('stores every rulesets/*.json as a rulebook of the demo club with a published version 1', async () => {
    const rows = await db.ds.query(
      `SELECT r.slug, r.title, r.publisher, v.version_number, v.status, v.edition, v.effective_date::text AS effective_date, v.lock_version,
              v.published_at IS NOT NULL AS published, u.email AS published_by
       FROM rulebooks r JOIN ruleset_versions v ON v.rulebook_id = r.id LEFT JOIN users u ON u.id = v.published_by
       WHERE r.club_id = $1 ORDER BY r.slug`,
      [clubId],
    );
    expect(rows).toEqual([
      { slug: cageFile, title: 'Tarnwick Vale MC Cage Regulations', publisher: 'Tarnwick Vale Motor Club', version_number: 1, status: 'published', edition: '2027', effective_date: '2026-11-01', lock_version: 1, published: true, published_by: demo.admin },
      { slug: hillFile, title: 'Tarnwick Vale MC Hillclimb Cage Schedule', publisher: 'Tarnwick Vale Motor Club', version_number: 1, status: 'published', edition: '2027', effective_date: '2026-11-15', lock_version: 1, published: true, published_by: demo.admin },
    ]);
    const stored: { document: unknown }[] = await db.ds.query('SELECT document FROM ruleset_versions WHERE id = $1', [await versionIdOf(cageFile)]);
    expect(stored[0]!.document).toEqual(await fileDocument(cageFile));
  });

  it('is idempotent and never touches a rulebook that already has versions', async () => {
    const before = await db.ds.query('SELECT id, rulebook_id, version_number, status, document, updated_at FROM ruleset_versions ORDER BY id');
    expect(await seedDemoRulesets(db.ds, await seedContext())).toEqual({ rulebooks: 0, versions: 0 });
    const summary = await seedDemo(db.ds);
    expect(summary.steps).toEqual(['rulesets']);
    expect(await db.ds.query('SELECT id, rulebook_id, version_number, status, document, updated_at FROM ruleset_versions ORDER BY id')).toEqual(before);
  });

  it('puts back a missing rulebook', async () => {
    const id = await versionIdOf(hillFile);
    // Published versions cannot be deleted, so the whole table is emptied the way the test reset does.
    await db.ds.query('TRUNCATE ruleset_versions, rulebooks CASCADE');
    expect(await seedDemoRulesets(db.ds, await seedContext())).toEqual({ rulebooks: 2, versions: 2 });
    expect(await versionIdOf(hillFile)).not.toBe(id);
  });

  it('stops at a document with problems, names the file and every path, and writes nothing', async () => {
    const folder = await mkdtemp(join(tmpdir(), 'cw-rulesets-'));
    try {
      const good = JSON.parse(await readFile(join('rulesets', `${cageFile}.json`), 'utf8'));
      await writeFile(join(folder, 'a-good-one.json'), JSON.stringify(good));
      const bad = structuredClone(good);
      bad.rulebook.effectiveDate = '1 Jan 2027';
      bad.requirements[0].section = '';
      bad.requirements[1].appliesTo.classes = ['no-such-class'];
      await writeFile(join(folder, 'b-bad-one.json'), JSON.stringify(bad));
      const before = await db.ds.query('SELECT count(*)::int AS n FROM rulebooks');
      const err = await seedDemoRulesets(db.ds, await seedContext(), folder).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(Error);
      const message = (err as Error).message;
      expect(message).toMatch(/^rulesets\/b-bad-one\.json is not a valid ruleset document/);
      expect(message).toContain('rulebook.effectiveDate: A date as YYYY-MM-DD');
      expect(message).toContain('requirements.0.section: Required');
      // The structural pass stops before the meaning checks, so the unknown class waits for the next run.
      expect(await db.ds.query('SELECT count(*)::int AS n FROM rulebooks')).toEqual(before);

      bad.rulebook.effectiveDate = '2027-01-01';
      bad.requirements[0].section = 'C3.1.1';
      await writeFile(join(folder, 'b-bad-one.json'), JSON.stringify(bad));
      await expect(loadDemoRulesets(folder)).rejects.toThrow(/requirements\.1\.appliesTo\.classes\.0: Unknown class "no-such-class"/);
      await writeFile(join(folder, 'b-bad-one.json'), '{ "formatVersion": 1,');
      await expect(loadDemoRulesets(folder)).rejects.toThrow(/b-bad-one\.json is not a valid ruleset document \(1 problem\):\n {2}\(document\): Not readable JSON/);
    } finally {
      await rm(folder, { recursive: true, force: true });
    }
  });

  it('is the seed step named "rulesets"', () => {
    expect(rulesetSeedStep.name).toBe('rulesets');
  });
});

describe('GET /api/clubs/:clubId/rulebooks', () => {
  const summary = (document: Awaited<ReturnType<typeof fileDocument>>) => ({
    classes: document.classes.map((c) => ({ id: c.id, name: c.name, weightBasis: c.weightBasis })),
    requirementCount: document.requirements.length,
  });

  it.each([demo.builder, demo.steward, demo.admin])('lists the club’s rulebooks with their versions for %s', async (email) => {
    const agent = agentFor(app);
    await signIn(agent, email);
    const res = await agent.get(`/api/clubs/${clubId}/rulebooks`).expect(200);
    const cage = await fileDocument(cageFile);
    const hill = await fileDocument(hillFile);
    const book = (slug: string, title: string) => ({ id: expect.any(String), clubId, slug, title, publisher: 'Tarnwick Vale Motor Club', createdAt: isoTime });
    expect(res.body).toEqual({
      rulebooks: [
        {
          ...book(cageFile, 'Tarnwick Vale MC Cage Regulations'),
          versions: [{ id: await versionIdOf(cageFile), rulebookId: res.body.rulebooks[0].id, versionNumber: 1, status: 'published', edition: '2027', effectiveDate: '2026-11-01', publishedAt: isoTime, ...summary(cage) }],
        },
        {
          ...book(hillFile, 'Tarnwick Vale MC Hillclimb Cage Schedule'),
          versions: [{ id: await versionIdOf(hillFile), rulebookId: res.body.rulebooks[1].id, versionNumber: 1, status: 'published', edition: '2027', effectiveDate: '2026-11-15', publishedAt: isoTime, ...summary(hill) }],
        },
      ],
    });
    expect(res.body.rulebooks[0].versions[0].classes.map((c: { id: string }) => c.id)).toEqual(['open-sprint', 'club-saloon', 'heavy-special']);
  });

  it('answers 404 to a member of another club and for an unknown club, 401 when signed out', async () => {
    const agent = agentFor(app);
    await signIn(agent, outsider, 'other-admin-password');
    await agent.get(`/api/clubs/${clubId}/rulebooks`).expect(404).expect(hasErrorBody(clubNotFound));
    await agent.get(`/api/clubs/${randomUUID()}/rulebooks`).expect(404).expect(hasErrorBody(clubNotFound));
    await agentFor(app).get(`/api/clubs/${clubId}/rulebooks`).expect(401).expect(hasErrorBody(unauthenticated));
  });
});

describe('GET /api/ruleset-versions/:versionId', () => {
  it.each([demo.builder, demo.steward, demo.admin])('gives %s the version with its document', async (email) => {
    const agent = agentFor(app);
    await signIn(agent, email);
    const id = await versionIdOf(hillFile);
    const res = await agent.get(`/api/ruleset-versions/${id}`).expect(200);
    const document = await fileDocument(hillFile);
    expect(res.body.version).toMatchObject({
      id, versionNumber: 1, status: 'published', edition: '2027', effectiveDate: '2026-11-15', lockVersion: 1,
      rulebook: { clubId, slug: hillFile, title: 'Tarnwick Vale MC Hillclimb Cage Schedule', publisher: 'Tarnwick Vale Motor Club' },
      classes: [{ id: 'hill-saloon', name: document.classes[0]!.name, weightBasis: document.classes[0]!.weightBasis }],
      requirementCount: document.requirements.length,
      publishedAt: isoTime, createdAt: isoTime, updatedAt: isoTime,
    });
    expect(res.body.version.document).toEqual(document);
  });

  it('answers 404 to another club’s member and for an unknown id, 400 for a malformed id, 401 when signed out', async () => {
    const id = await versionIdOf(cageFile);
    const agent = agentFor(app);
    await signIn(agent, outsider, 'other-admin-password');
    await agent.get(`/api/ruleset-versions/${id}`).expect(404).expect(hasErrorBody(versionNotFound));
    await agent.get(`/api/ruleset-versions/${randomUUID()}`).expect(404).expect(hasErrorBody(versionNotFound));
    await agent.get('/api/ruleset-versions/not-an-id').expect(400).expect(hasErrorBody({
      error: { code: 'validation_failed', message: 'Some fields are invalid.', details: [{ path: 'params.versionId', message: 'Must be an id' }] },
    }));
    await agentFor(app).get(`/api/ruleset-versions/${id}`).expect(401).expect(hasErrorBody(unauthenticated));
  });
});

describe('drafts', () => {
  let draftId: string;
  beforeAll(async () => {
    const rows: { id: string }[] = await db.ds.query(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document)
       SELECT rulebook_id, 2, 'draft', '2028 draft', '2028-01-01', document FROM ruleset_versions WHERE id = $1 RETURNING id`,
      [await versionIdOf(cageFile)],
    );
    draftId = rows[0]!.id;
  });

  it('are listed and readable for the club’s admins only', async () => {
    const admin = agentFor(app);
    await signIn(admin, demo.admin);
    const listed = await admin.get(`/api/clubs/${clubId}/rulebooks`).expect(200);
    expect(listed.body.rulebooks[0].versions.map((v: { versionNumber: number; status: string }) => [v.versionNumber, v.status])).toEqual([[2, 'draft'], [1, 'published']]);
    expect((await admin.get(`/api/ruleset-versions/${draftId}`).expect(200)).body.version).toMatchObject({ status: 'draft', publishedAt: null, edition: '2028 draft' });

    for (const email of [demo.builder, demo.steward]) {
      const agent = agentFor(app);
      await signIn(agent, email);
      const res = await agent.get(`/api/clubs/${clubId}/rulebooks`).expect(200);
      expect(res.body.rulebooks[0].versions.map((v: { versionNumber: number }) => v.versionNumber)).toEqual([1]);
      await agent.get(`/api/ruleset-versions/${draftId}`).expect(404).expect(hasErrorBody(versionNotFound));
    }
  });

  it('may change and be deleted; every content change moves the lock version on', async () => {
    await db.ds.query(`UPDATE ruleset_versions SET edition = '2028 draft b' WHERE id = $1`, [draftId]);
    await db.ds.query(`UPDATE ruleset_versions SET edition = '2028 draft c', lock_version = lock_version + 1 WHERE id = $1`, [draftId]);
    expect(await db.ds.query('SELECT edition, lock_version FROM ruleset_versions WHERE id = $1', [draftId])).toEqual([{ edition: '2028 draft c', lock_version: 3 }]);
    await expect(db.ds.query(`UPDATE ruleset_versions SET status = 'retired' WHERE id = $1`, [draftId])).rejects.toThrow(/A draft ruleset version can only be published, not moved to retired/);
    await db.ds.query('DELETE FROM ruleset_versions WHERE id = $1', [draftId]);
    expect(await db.ds.query('SELECT id FROM ruleset_versions WHERE id = $1', [draftId])).toEqual([]);
  });
});

describe('a published version in the database', () => {
  const immutable = (id: string, what: RegExp) => expect.objectContaining({ code: 'CW001', message: expect.stringMatching(what) });
  const attempt = (sql: string, params: unknown[]) => db.ds.query(sql, params).then(() => 'done', (e: unknown) => e);

  it('refuses any change to its document, edition, date or number, and deletion', async () => {
    const id = await versionIdOf(cageFile);
    const content = /is published: its content cannot change/;
    expect(await attempt(`UPDATE ruleset_versions SET document = jsonb_set(document, '{rulebook,edition}', '"2026"') WHERE id = $1`, [id])).toEqual(immutable(id, content));
    expect(await attempt(`UPDATE ruleset_versions SET edition = 'changed' WHERE id = $1`, [id])).toEqual(immutable(id, content));
    expect(await attempt(`UPDATE ruleset_versions SET effective_date = '2027-02-01' WHERE id = $1`, [id])).toEqual(immutable(id, content));
    expect(await attempt(`UPDATE ruleset_versions SET version_number = 7 WHERE id = $1`, [id])).toEqual(immutable(id, content));
    expect(await attempt(`DELETE FROM ruleset_versions WHERE id = $1`, [id])).toEqual(immutable(id, /only a draft can be deleted/));
    expect(await attempt(`UPDATE ruleset_versions SET status = 'draft' WHERE id = $1`, [id])).toEqual(immutable(id, /cannot move from published to draft/));
  });

  it('moves published → superseded → retired, and no way back', async () => {
    const id = await versionIdOf(hillFile);
    expect(await attempt(`UPDATE ruleset_versions SET status = 'superseded' WHERE id = $1`, [id])).toBe('done');
    expect(await attempt(`UPDATE ruleset_versions SET status = 'published' WHERE id = $1`, [id])).toEqual(immutable(id, /cannot move from superseded to published/));
    expect(await attempt(`UPDATE ruleset_versions SET status = 'retired' WHERE id = $1`, [id])).toBe('done');
    expect(await attempt(`UPDATE ruleset_versions SET status = 'superseded' WHERE id = $1`, [id])).toEqual(immutable(id, /cannot move from retired to superseded/));
    expect(await db.ds.query('SELECT status, edition FROM ruleset_versions WHERE id = $1', [id])).toEqual([{ status: 'retired', edition: '2027' }]);
  });

  it('allows at most one published version per rulebook', async () => {
    const v1 = await versionIdOf(cageFile);
    const err = await attempt(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document, published_at)
       SELECT rulebook_id, 3, 'published', '2029', '2029-01-01', document, now() FROM ruleset_versions WHERE id = $1`,
      [v1],
    );
    expect(err).toEqual(expect.objectContaining({ code: '23505', constraint: 'UQ_ruleset_versions_one_published' }));
  });
});
