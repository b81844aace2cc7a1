// Creating a new rulebook (issue 13 §4): blank (a first class and the registry's unfinished starter tube
// table, which cannot be put in force until its section and sizes are filled in) or from a ruleset file (validated, refused at its paths, nothing
// created); titles are unique in the club; builders and stewards get 403, strangers 404; the creation is
// in the activity log.
import { readFileSync } from 'node:fs';
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, useTestDatabase } from './helpers';
import { everyone, garageFixture, type GarageFixture, type SignedIn } from './garage-fixtures';

const db = useTestDatabase();
let app: Express;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;

beforeAll(async () => {
  fx = await garageFixture(db.ds);
  app = makeTestApp(db.ds);
  who = await everyone(app);
}, 60_000);

const create = (s: SignedIn, body: unknown) => s.agent.post(`/api/clubs/${fx.clubId}/rulebooks`).set('X-CSRF-Token', s.token).send(body as object);
const blank = { start: 'blank', title: 'Quarry Sprint Cage Rules', publisher: 'Tarnwick Vale Motor Club', edition: '2028', unitSystem: 'metric' };
const bookCount = async () => ((await db.ds.query('SELECT count(*)::int AS n FROM rulebooks WHERE club_id = $1', [fx.clubId])) as { n: number }[])[0]!.n;

describe('creating a rulebook', () => {
  it('creates a blank rulebook with its first version as a draft, and logs it', async () => {
    const res = await create(who.admin, blank).expect(201);
    const v = res.body.version;
    expect(v).toMatchObject({ versionNumber: 1, status: 'draft', edition: '2028', rulebook: { title: 'Quarry Sprint Cage Rules', publisher: 'Tarnwick Vale Motor Club', slug: 'quarry-sprint-cage-rules' } });
    expect(v.document).toMatchObject({ unitSystem: 'metric', classes: [{ id: 'class-1', name: 'First class' }], requirements: [{ id: 'tubes-1', requires: { template: 'tube_table' } }] });
    // Unfinished on purpose: the draft names what is missing, and cannot be put in force as it stands.
    const saved = await who.admin.agent.put(`/api/ruleset-drafts/${v.id}`).set('X-CSRF-Token', who.admin.token).send({ lockVersion: v.lockVersion, document: v.document }).expect(200);
    const paths = saved.body.draft.problems.map((p: { path: string }) => p.path) as string[];
    expect(paths).toContain('requirements.0.section');
    expect(paths.some((p) => p.startsWith('requirements.0.requires.bands.0.rows.0.alternatives.0.'))).toBe(true);
    const publish = await who.admin.agent.post(`/api/ruleset-drafts/${v.id}/publish`).set('X-CSRF-Token', who.admin.token).send({ lockVersion: saved.body.draft.lockVersion, effectiveDate: '2028-01-01' });
    expect(publish.status).toBe(409);

    const listed = await who.admin.agent.get(`/api/clubs/${fx.clubId}/rulebooks`).expect(200);
    expect(listed.body.rulebooks.map((b: { title: string }) => b.title)).toContain('Quarry Sprint Cage Rules');
    const log = await who.admin.agent.get(`/api/clubs/${fx.clubId}/audit?action=ruleset.rulebook_created`).expect(200);
    expect(log.body.entries[0]).toMatchObject({
      actor: { email: 'admin@tarnwick.example' },
      details: { rulebookTitle: 'Quarry Sprint Cage Rules', versionNumber: 1, edition: '2028', fromFile: false },
      subjects: { edition: { id: v.id, name: 'Quarry Sprint Cage Rules, version 1 (edition 2028)', open: true } },
    });
  });

  it('creates one from a ruleset file, named by the file', async () => {
    const doc = JSON.parse(readFileSync('rulesets/tarnwick-vale-mc-hillclimb-2027-metric.json', 'utf8')) as { rulebook: Record<string, string> };
    doc.rulebook.title = 'Hillclimb Cage Rules (copy)';
    const res = await create(who.admin, { start: 'file', text: JSON.stringify(doc) }).expect(201);
    expect(res.body.version).toMatchObject({ versionNumber: 1, status: 'draft', rulebook: { title: 'Hillclimb Cage Rules (copy)', slug: 'hillclimb-cage-rules-copy' } });
    expect(res.body.version.document.requirements.length).toBeGreaterThan(0);
  });

  it('refuses a title the club already has, at the field, and creates nothing', async () => {
    const before = await bookCount();
    const res = await create(who.admin, { ...blank, title: '  quarry sprint cage rules ' }).expect(400);
    expect(res.body.error.details).toEqual([
      { path: 'title', message: 'The club already has a rulebook called “quarry sprint cage rules”. Start a new edition of it instead, or choose another title.' },
    ]);
    expect(await bookCount()).toBe(before);
  });

  it('names every bad field of a blank start, and every problem of a bad file', async () => {
    const before = await bookCount();
    const bad = await create(who.admin, { start: 'blank', title: ' ', publisher: 'x'.repeat(201), unitSystem: 'furlongs' }).expect(400);
    expect(bad.body.error.details).toEqual([
      { path: 'title', message: 'Give the title' },
      { path: 'publisher', message: 'At most 200 characters' },
      { path: 'edition', message: 'Must be the edition name' },
      { path: 'unitSystem', message: 'Must be imperial or metric' },
    ]);
    const how = await create(who.admin, { start: 'copy' }).expect(400);
    expect(how.body.error.details).toEqual([{ path: 'start', message: 'Must be "blank" or "file"' }]);
    const notJson = await create(who.admin, { start: 'file', text: '{ nope' }).expect(400);
    expect(notJson.body.error.details[0]).toMatchObject({ path: 'text', message: expect.stringMatching(/^The file is not valid JSON/) });
    const invalid = await create(who.admin, { start: 'file', text: JSON.stringify({ formatVersion: 1, rulebook: { title: 'Half a book' }, classes: [], requirements: [] }) }).expect(400);
    expect(invalid.body.error.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['text.rulebook.publisher', 'text.classes', 'text.requirements']));
    expect(await bookCount()).toBe(before);
  });

  it('refuses builders and stewards (403) and strangers (404), creating nothing', async () => {
    const before = await bookCount();
    expect((await create(who.builder, { ...blank, title: 'Builder book' })).status).toBe(403);
    expect((await create(who.steward, { ...blank, title: 'Steward book' })).status).toBe(403);
    expect((await create(who.outsider, { ...blank, title: 'Outsider book' })).status).toBe(404);
    expect((await who.admin.agent.post(`/api/clubs/${fx.clubId}/rulebooks`).send(blank)).status).toBe(403); // no CSRF token
    expect(await bookCount()).toBe(before);
  });
});
