// One build sheet against several rulebooks (issue 13 §5): the choices (every edition in force in the
// builder's clubs, a class suggested for each), the matrix from the ordinary check engine, who may ask,
// and the input refused with its reason. The second club is the demo seed's own (seed-second-club.ts).
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { secondClubStep } from '../../backend/src/db/seed-second-club';
import { Club, Rulebook, RulesetVersion, User } from '../../backend/src/entities';
import { demo, errorBody, makeTestApp, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, saloonSpec, type GarageFixture, type SignedIn } from './garage-fixtures';

const db = useTestDatabase();
let app: Express;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;
let sheetId: string;
const v: Record<'hill' | 'wexcombe' | 'fenmoor' | 'scheduled', string> = { hill: '', wexcombe: '', fenmoor: '', scheduled: '' };

/** The demo saloon with both weights: Wexcombe's bands read the weight without driver. */
const spec = () => {
  const s = saloonSpec();
  return { ...s, vehicle: { ...s.vehicle, weightWithoutDriverKg: 1120 } };
};
const post = (s: SignedIn, url: string) => s.agent.post(url).set('X-CSRF-Token', s.token);
const compare = (s: SignedIn, body: unknown) => post(s, `/api/build-sheets/${sheetId}/side-by-side`).send(body as object);

async function versionOf(slug: string): Promise<string> {
  const [row]: { id: string }[] = await db.ds.query(`SELECT v.id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.slug = $1 AND v.status = 'published'`, [slug]);
  return row!.id;
}

beforeAll(async () => {
  fx = await garageFixture(db.ds);
  app = makeTestApp(db.ds);
  who = await everyone(app);
  const builder = await db.ds.getRepository(User).findOneByOrFail({ email: demo.builder });
  // The demo seed's second club with its rulebook in force, the builder a member (the CLI seed's step).
  await secondClubStep.run(db.ds, { club: await db.ds.getRepository(Club).findOneByOrFail({ id: fx.clubId }), usersByEmail: new Map([[demo.builder, builder]]) });
  v.hill = await versionOf('tarnwick-vale-mc-hillclimb-2027-metric');
  v.wexcombe = await versionOf('wexcombe-safety-cage-schedule-2027');
  // A club the builder is not in, with a rulebook in force.
  const [fenmoor]: { id: string }[] = await db.ds.query(`INSERT INTO clubs (slug, name) VALUES ('fenmoor-side', 'Fenmoor Side Club') RETURNING id`);
  const wx = await db.ds.getRepository(RulesetVersion).findOneByOrFail({ id: v.wexcombe });
  const book = await db.ds.getRepository(Rulebook).save({ clubId: fenmoor!.id, slug: 'fenmoor-cages', title: 'Fenmoor Cages', publisher: 'Fenmoor Side Club' });
  v.fenmoor = (await db.ds.getRepository(RulesetVersion).save({ rulebookId: book.id, versionNumber: 1, status: 'published', edition: '2027', effectiveDate: '2026-10-01', document: wx.document, publishedAt: new Date() })).id;
  // A scheduled edition in the builder's second club (published ahead of its date).
  const wxBook = await db.ds.getRepository(Rulebook).save({ clubId: (await db.ds.getRepository(Rulebook).findOneByOrFail({ id: wx.rulebookId })).clubId, slug: 'wexcombe-next', title: 'Wexcombe Next', publisher: 'Wexcombe' });
  v.scheduled = (await db.ds.getRepository(RulesetVersion).save({ rulebookId: wxBook.id, versionNumber: 1, status: 'scheduled', edition: '2028', effectiveDate: '2028-01-01', document: wx.document, publishedAt: new Date() })).id;
  ({ sheetId } = await carWithSheet(who.builder, fx, spec()));
}, 60_000);

describe('the choices', () => {
  it('are the sheet’s own rulebook as home and every other edition in force in the builder’s clubs, with a class suggested or left to pick', async () => {
    const res = await who.builder.agent.get(`/api/build-sheets/${sheetId}/side-by-side`).expect(200);
    expect(res.body.home).toMatchObject({ rulesetVersionId: fx.versionId, classId: 'club-saloon', className: 'Club Saloon (full cage)' });
    const options = res.body.options as { rulesetVersionId: string; club: { name: string }; suggestedClassId: string | null; classes: { id: string }[] }[];
    expect(options.map((o) => o.rulesetVersionId).sort()).toEqual([v.hill, v.wexcombe].sort());
    // One class: it is the suggestion. Two classes, neither named like the sheet's: the builder picks.
    expect(options.find((o) => o.rulesetVersionId === v.hill)).toMatchObject({ suggestedClassId: 'hill-saloon', club: { name: 'Tarnwick Vale Motor Club' } });
    expect(options.find((o) => o.rulesetVersionId === v.wexcombe)).toMatchObject({ suggestedClassId: null, club: { name: 'Wexcombe Hill & Sprint Association' } });
  });
});

describe('the matrix', () => {
  it('has the home rulebook first, a verdict per rulebook from the same engine as a check, and one line for all', async () => {
    const res = await compare(who.builder, { columns: [{ rulesetVersionId: v.wexcombe, classId: 'wx-saloon' }, { rulesetVersionId: v.hill, classId: 'hill-saloon' }], unitSystem: 'imperial' }).expect(200);
    const { comparison, columns, line } = res.body;
    expect(columns.map((c: { rulesetVersionId: string }) => c.rulesetVersionId)).toEqual([fx.versionId, v.wexcombe, v.hill]);
    expect(comparison.columns.map((c: { home: boolean; classId: string }) => [c.home, c.classId])).toEqual([[true, 'club-saloon'], [false, 'wx-saloon'], [false, 'hill-saloon']]);
    // Each column's verdict is what an ordinary dry run of the same specification gets.
    for (const [versionId, classId, i] of [[fx.versionId, 'club-saloon', 0], [v.wexcombe, 'wx-saloon', 1], [v.hill, 'hill-saloon', 2]] as const) {
      const s = spec();
      const dry = await post(who.builder, '/api/checks').send({ rulesetVersionId: versionId, classId, specification: { ...s, vehicle: { ...s.vehicle, classId } } }).expect(200);
      expect(comparison.columns[i].verdict).toBe(dry.body.report.verdict);
    }
    const hoop = comparison.rows.find((r: { key: string }) => r.key === 'member:main_hoop');
    expect(hoop.cells).toHaveLength(3);
    // The demo club's saloon table (C4.2.2) and Wexcombe's W-12.1 both govern the main hoop.
    expect(hoop.cells[0].sections).toContain('C4.2.2');
    expect(hoop.cells[1].sections).toContain('W-12.1');
    expect(hoop.tubes.demands.every((d: unknown) => d !== null)).toBe(true);
    expect(typeof line).toBe('string');
    expect(line).toMatch(/rulebooks at once/);
  });
});

describe('who may compare', () => {
  it('refuses a rulebook of a club the builder is not in, as not found', async () => {
    const res = await compare(who.builder, { columns: [{ rulesetVersionId: v.fenmoor, classId: 'wx-saloon' }] }).expect(404);
    expect(res.body).toEqual(errorBody({ error: { code: 'not_found', message: 'Ruleset version not found.' } }));
    await compare(who.builder, { columns: [{ rulesetVersionId: randomUUID(), classId: 'wx-saloon' }] }).expect(404);
  });

  it('is the car’s owner: the club’s steward reads the sheet but gets 403, another builder and an outsider 404', async () => {
    const body = { columns: [{ rulesetVersionId: v.hill, classId: 'hill-saloon' }] };
    await compare(who.steward, body).expect(403);
    await compare(who.otherBuilder, body).expect(404);
    await compare(who.outsider, body).expect(404);
    await who.steward.agent.get(`/api/build-sheets/${sheetId}/side-by-side`).expect(403);
  });
});

describe('bad input', () => {
  it.each([
    ['no other rulebook', { columns: [] }, 'columns'],
    ['a class the rulebook does not have', { columns: [{ rulesetVersionId: 'HILL', classId: 'club-saloon' }] }, 'columns.0.classId'],
    ['the same rulebook twice', { columns: [{ rulesetVersionId: 'HILL', classId: 'hill-saloon' }, { rulesetVersionId: 'HILL', classId: 'hill-saloon' }] }, 'columns.1.rulesetVersionId'],
    ['the sheet’s own rulebook', { columns: [{ rulesetVersionId: 'HOME', classId: 'club-saloon' }] }, 'columns.0.rulesetVersionId'],
    ['not an id', { columns: [{ rulesetVersionId: 'abc', classId: 'hill-saloon' }] }, 'columns.0.rulesetVersionId'],
    ['an unknown field', { columns: [{ rulesetVersionId: 'HILL', classId: 'hill-saloon' }], extra: 1 }, ''],
  ])('%s: 400 at its path', async (_name, body, path) => {
    const filled = JSON.parse(JSON.stringify(body).replaceAll('HILL', v.hill).replaceAll('HOME', fx.versionId)) as object;
    const res = await compare(who.builder, filled).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(path);
  });

  it('an edition not yet in force is refused with its date', async () => {
    const res = await compare(who.builder, { columns: [{ rulesetVersionId: v.scheduled, classId: 'wx-saloon' }] }).expect(409);
    expect(res.body.error.message).toContain('not in force until 1 Jan 2028');
  });
});
