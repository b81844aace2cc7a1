// The build journal over the API: stages with dates and notes in build order, photos through the
// photo pipeline with limits of their own (the sheet's photos untouched), who may read and change
// it, bad input at its field, and every stage change in the club's activity log.
import { mkdtemp, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { beforeAll, describe, expect, it } from 'vitest';
import { JOURNAL_LIMITS } from '../../backend/src/contracts/journal';
import { makeTestApp, testConfig, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, testJpeg, type GarageFixture, type SignedIn } from './garage-fixtures';

const db = useTestDatabase();
let uploadDir: string;
let app: ReturnType<typeof makeTestApp>;
let who: Awaited<ReturnType<typeof everyone>>;
let fx: GarageFixture;
let sheetId: string;

const send = (as: SignedIn, method: 'post' | 'patch' | 'delete', url: string) => as.agent[method](url).set('X-CSRF-Token', as.token);
const journalUrl = () => `/api/build-sheets/${sheetId}/journal`;
const today = () => new Date().toISOString().slice(0, 10);

async function journalFiles(): Promise<string[]> {
  const entries = await readdir(uploadDir, { recursive: true, withFileTypes: true }).catch(() => []);
  return entries.filter((e) => e.isFile() && e.parentPath.includes('journal')).map((e) => e.name).sort();
}

beforeAll(async () => {
  uploadDir = await mkdtemp(join(tmpdir(), 'cw-journal-api-'));
  app = makeTestApp(db.ds, { config: testConfig({ UPLOAD_DIR: uploadDir }) });
  fx = await garageFixture(db.ds);
  who = await everyone(app);
  ({ sheetId } = await carWithSheet(who.builder, fx));
});

describe('stages of the build', () => {
  it('starts empty, lists our stage names in build order, and says who may change it', async () => {
    const mine = await who.builder.agent.get(journalUrl()).expect(200);
    expect(mine.body).toMatchObject({ sheetId, entries: [], photoCount: 0, canEdit: true, limits: JOURNAL_LIMITS });
    expect(mine.body.stages.map((s: { stage: string }) => s.stage)).toEqual(['cut_and_bent', 'fitted', 'tacked', 'fully_welded', 'finished']);
    expect(mine.body.caution).toMatch(/qualified people working under local rules.*not a substitute for measuring the car/);
    expect((await who.steward.agent.get(journalUrl()).expect(200)).body.canEdit).toBe(false);
    expect((await who.admin.agent.get(journalUrl()).expect(200)).body.canEdit).toBe(false);
    await who.otherBuilder.agent.get(journalUrl()).expect(404);
    await who.outsider.agent.get(journalUrl()).expect(404);
  });

  it('records stages with a date and a note, in build order whatever order they were typed in', async () => {
    const tacked = await send(who.builder, 'post', journalUrl()).send({ stage: 'tacked', happenedOn: '2026-11-14', note: '  Tacked in the car, door bars last.  ' }).expect(201);
    expect(tacked.body.entry).toMatchObject({ stage: 'tacked', happenedOn: '2026-11-14', note: 'Tacked in the car, door bars last.', photos: [], createdBy: { displayName: expect.any(String) } });
    await send(who.builder, 'post', journalUrl()).send({ stage: 'fitted', happenedOn: '2026-11-07' }).expect(201);
    const list = await who.builder.agent.get(journalUrl()).expect(200);
    expect(list.body.entries.map((e: { stage: string; note: string }) => [e.stage, e.note])).toEqual([['fitted', ''], ['tacked', 'Tacked in the car, door bars last.']]);
    const dup = await send(who.builder, 'post', journalUrl()).send({ stage: 'tacked', happenedOn: '2026-11-15' }).expect(409);
    expect(dup.body.error.message).toMatch(/“Tacked” is already in the journal \(2026-11-14\)/);
  });

  it('refuses bad input at its field, and nothing is recorded', async () => {
    const cases: [unknown, string][] = [
      [{ stage: 'painted', happenedOn: '2026-11-14' }, 'stage'],
      [{ stage: 'finished', happenedOn: '2026-02-30' }, 'happenedOn'],
      [{ stage: 'finished', happenedOn: '14/11/2026' }, 'happenedOn'],
      [{ stage: 'finished', happenedOn: '2999-01-01' }, 'happenedOn'],
      [{ stage: 'finished', happenedOn: '1900-01-01' }, 'happenedOn'],
      [{ stage: 'finished', happenedOn: today(), note: 'x'.repeat(JOURNAL_LIMITS.noteChars + 1) }, 'note'],
      [{ stage: 'finished', happenedOn: today(), colour: 'red' }, ''],
      [{ happenedOn: today() }, 'stage'],
    ];
    for (const [body, path] of cases) {
      const res = await send(who.builder, 'post', journalUrl()).send(body as object).expect(400);
      expect([body, res.body.error.details.map((d: { path: string }) => d.path)]).toEqual([body, [path]]);
    }
    const future = await send(who.builder, 'post', journalUrl()).send({ stage: 'finished', happenedOn: '2999-01-01' }).expect(400);
    expect(future.body.error.details[0].message).toMatch(/cannot be dated in the future/);
    expect((await who.builder.agent.get(journalUrl())).body.entries).toHaveLength(2);
  });

  it('refuses stewards, admins and other builders from changing it', async () => {
    const entry = (await who.builder.agent.get(journalUrl())).body.entries[0];
    for (const p of [who.steward, who.admin]) {
      await send(p, 'post', journalUrl()).send({ stage: 'finished', happenedOn: today() }).expect(403);
      await send(p, 'patch', `/api/journal-entries/${entry.id}`).send({ note: 'no' }).expect(403);
      await send(p, 'delete', `/api/journal-entries/${entry.id}`).expect(403);
    }
    await send(who.otherBuilder, 'post', journalUrl()).send({ stage: 'finished', happenedOn: today() }).expect(404);
    await send(who.otherBuilder, 'patch', `/api/journal-entries/${entry.id}`).send({ note: 'no' }).expect(404);
    await send(who.builder, 'patch', `/api/journal-entries/${entry.id}`).send({}).expect(400);
    await send(who.builder, 'patch', '/api/journal-entries/not-a-uuid').send({ note: 'x' }).expect(400);
    const changed = await send(who.builder, 'patch', `/api/journal-entries/${entry.id}`).send({ happenedOn: '2026-11-08', note: 'Fitted with the seat in.' }).expect(200);
    expect(changed.body.entry).toMatchObject({ happenedOn: '2026-11-08', note: 'Fitted with the seat in.' });
  });
});

describe('journal photos', () => {
  it('go through the photo pipeline and never count against the sheet’s photos', async () => {
    const entry = (await who.builder.agent.get(journalUrl())).body.entries[0];
    const rotated = await sharp({ create: { width: 400, height: 200, channels: 3, background: '#446688' } }).withMetadata({ orientation: 6 }).jpeg().toBuffer();
    const res = await send(who.builder, 'post', `/api/journal-entries/${entry.id}/photos`)
      .attach('photos', rotated, 'fit-1.jpg').attach('photos', await testJpeg(), 'fit-2.jpg')
      .field('captions', 'Left side').field('captions', '')
      .expect(201);
    expect(res.body.photos).toEqual([
      expect.objectContaining({ entryId: entry.id, caption: 'Left side', widthPx: 200, heightPx: 400 }),
      expect.objectContaining({ caption: '', widthPx: 640, heightPx: 480 }),
    ]);
    expect(await journalFiles()).toHaveLength(4);
    const image = await who.steward.agent.get(res.body.photos[0].imageUrl).buffer(true).expect(200);
    const meta = await sharp(image.body as Buffer).metadata();
    expect([image.headers['content-type'], meta.exif, meta.orientation]).toEqual(['image/jpeg', undefined, undefined]);
    await who.outsider.agent.get(res.body.photos[0].imageUrl).expect(404);
    await who.otherBuilder.agent.get(res.body.photos[0].thumbnailUrl).expect(404);
    // The sheet's own photos are untouched and its 60 are all still free.
    expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}/photos`).expect(200)).body.photos).toEqual([]);
    expect((await who.builder.agent.get(journalUrl())).body.photoCount).toBe(2);
  });

  it('refuses what is not a photo, other people’s uploads, and more than a stage holds', async () => {
    const entry = (await who.builder.agent.get(journalUrl())).body.entries[0];
    const url = `/api/journal-entries/${entry.id}/photos`;
    const bad = await send(who.builder, 'post', url).attach('photos', Buffer.from('not an image at all'), 'notes.txt').expect(400);
    expect(bad.body.error.details[0].path).toBe('photos.0');
    await send(who.builder, 'post', url).field('captions', 'no file').expect(400);
    await send(who.steward, 'post', url).attach('photos', await testJpeg(), 'x.jpg').expect(403);
    await send(who.otherBuilder, 'post', url).attach('photos', await testJpeg(), 'x.jpg').expect(404);
    const small = await testJpeg(64, 48);
    let req = send(who.builder, 'post', url);
    for (let i = 0; i < JOURNAL_LIMITS.photosPerStage - 2; i++) req = req.attach('photos', small, `p${i}.jpg`);
    await req.expect(201);
    const over = await send(who.builder, 'post', url).attach('photos', small, 'one-too-many.jpg').expect(409);
    expect(over.body.error).toMatchObject({ code: 'conflict', details: { limit: JOURNAL_LIMITS.photosPerStage, current: JOURNAL_LIMITS.photosPerStage } });
    expect((await who.builder.agent.get(journalUrl())).body.photoCount).toBe(JOURNAL_LIMITS.photosPerStage);
  });

  it('changes captions and removes photos for the builder only', async () => {
    const entry = (await who.builder.agent.get(journalUrl())).body.entries[0];
    const photo = entry.photos[0];
    await send(who.steward, 'patch', `/api/journal-photos/${photo.id}`).send({ caption: 'no' }).expect(403);
    expect((await send(who.builder, 'patch', `/api/journal-photos/${photo.id}`).send({ caption: 'Left side, seat in' }).expect(200)).body.photo.caption).toBe('Left side, seat in');
    await send(who.builder, 'patch', `/api/journal-photos/${photo.id}`).send({ caption: 'x'.repeat(301) }).expect(400);
    const before = (await journalFiles()).length;
    await send(who.steward, 'delete', `/api/journal-photos/${photo.id}`).expect(403);
    await send(who.builder, 'delete', `/api/journal-photos/${photo.id}`).expect(204);
    await send(who.builder, 'delete', `/api/journal-photos/${photo.id}`).expect(404);
    expect((await journalFiles()).length).toBe(before - 2);
  });
});

describe('removing a stage and the activity log', () => {
  it('removes a stage with its photos and files; every stage change is audited in the club’s log', async () => {
    const { entries } = (await who.builder.agent.get(journalUrl())).body;
    const fitted = entries.find((e: { stage: string }) => e.stage === 'fitted');
    await send(who.builder, 'delete', `/api/journal-entries/${fitted.id}`).expect(204);
    await send(who.builder, 'delete', `/api/journal-entries/${fitted.id}`).expect(404);
    expect(await journalFiles()).toEqual([]);
    expect((await who.builder.agent.get(journalUrl())).body.entries.map((e: { stage: string }) => e.stage)).toEqual(['tacked']);
    const log = await who.admin.agent.get(`/api/clubs/${fx.clubId}/audit?pageSize=100`).expect(200);
    const mine = log.body.entries.filter((e: { entityId: string }) => e.entityId === sheetId);
    expect(mine.map((e: { action: string }) => e.action).sort()).toEqual([
      'journal.photos_added', 'journal.photos_added', 'journal.stage_changed', 'journal.stage_recorded', 'journal.stage_recorded', 'journal.stage_removed',
    ]);
    const changed = mine.find((e: { action: string }) => e.action === 'journal.stage_changed');
    expect(changed.details).toMatchObject({ stage: 'fitted', before: { happenedOn: '2026-11-07', note: '' }, after: { happenedOn: '2026-11-08', note: 'Fitted with the seat in.' } });
  });

  it('keeps an archived sheet’s journal readable and unchanged', async () => {
    await send(who.builder, 'post', `/api/build-sheets/${sheetId}/archive`).expect(200);
    expect((await who.builder.agent.get(journalUrl()).expect(200)).body.canEdit).toBe(false);
    const refused = await send(who.builder, 'post', journalUrl()).send({ stage: 'finished', happenedOn: today() }).expect(409);
    expect(refused.body.error.message).toMatch(/archived/);
    await send(who.builder, 'post', `/api/build-sheets/${sheetId}/unarchive`).expect(200);
  });
});
