// Photos on a build sheet: upload (type read from the bytes, orientation fixed, EXIF/GPS dropped,
// thumbnail made), every refusal in the error shape with nothing half-saved and no stray file on
// disk, the per-sheet limit, serving with content type and cache headers, caption edits, delete,
// and who may see or change them.
import { mkdtemp, readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { beforeAll, describe, expect, it } from 'vitest';
import { errorBody, errorOf, hasErrorBody, makeTestApp, testConfig, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, testJpeg, type SignedIn } from './garage-fixtures';

const db = useTestDatabase();
let uploadDir: string;
let app: ReturnType<typeof makeTestApp>;
let who: Awaited<ReturnType<typeof everyone>>;
let sheetId: string;

async function filesOnDisk(): Promise<string[]> {
  const entries = await readdir(uploadDir, { recursive: true, withFileTypes: true });
  return entries.filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name)).sort();
}

function upload(as: SignedIn = who.builder, id = sheetId) {
  return as.agent.post(`/api/build-sheets/${id}/photos`).set('X-CSRF-Token', as.token);
}

beforeAll(async () => {
  uploadDir = await mkdtemp(join(tmpdir(), 'cw-photos-api-'));
  app = makeTestApp(db.ds, { config: testConfig({ UPLOAD_DIR: uploadDir }) });
  const fx = await garageFixture(db.ds);
  who = await everyone(app);
  ({ sheetId } = await carWithSheet(who.builder, fx));
});

describe('uploading photos', () => {
  it('stores re-encoded photos with thumbnails, captions and member ids, without EXIF or GPS', async () => {
    const rotated = await sharp({ create: { width: 400, height: 200, channels: 3, background: '#885533' } })
      .withExif({ IFD0: { Make: 'TestCam' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1' } })
      .withMetadata({ orientation: 6 }).jpeg().toBuffer();
    const png = await sharp({ create: { width: 300, height: 200, channels: 4, background: '#336699' } }).png().toBuffer();
    const res = await upload()
      .attach('photos', rotated, 'main-hoop.jpg').attach('photos', png, 'IMG_0042.PNG')
      .field('captions', 'Main hoop, left foot').field('captions', '')
      .field('memberIds', 'mh').field('memberIds', '')
      .field('areas', '').field('areas', 'mounting')
      .expect(201);
    expect(res.body.photos).toEqual([
      expect.objectContaining({ buildSheetId: sheetId, memberId: 'mh', area: 'members', caption: 'Main hoop, left foot', widthPx: 200, heightPx: 400 }),
      expect.objectContaining({ memberId: null, area: 'mounting', caption: '', widthPx: 300, heightPx: 200 }),
    ]);
    expect(await filesOnDisk()).toHaveLength(4);
    const [first] = res.body.photos;
    const image = await who.builder.agent.get(first.imageUrl).buffer(true).expect(200);
    expect(image.headers['content-type']).toBe('image/jpeg');
    expect(image.headers['cache-control']).toBe('private, max-age=31536000, immutable');
    const meta = await sharp(image.body as Buffer).metadata();
    expect([meta.format, meta.width, meta.height, meta.exif, meta.orientation]).toEqual(['jpeg', 200, 400, undefined, undefined]);
    const thumb = await who.builder.agent.get(first.thumbnailUrl).buffer(true).expect(200);
    const tmeta = await sharp(thumb.body as Buffer).metadata();
    expect(Math.max(tmeta.width!, tmeta.height!)).toBeLessThanOrEqual(320);
    const list = await who.builder.agent.get(`/api/build-sheets/${sheetId}/photos`).expect(200);
    expect(list.body.photos.map((p: { id: string }) => p.id)).toEqual(res.body.photos.map((p: { id: string }) => p.id));
  });

  it.each([
    ['a text file named .jpg', async () => Buffer.from('these are my notes, not a photo'), 'notes.jpg', /not an image Cagewright can read/],
    ['a JPEG cut off half way', async () => { const j = await testJpeg(800, 600); return j.subarray(0, Math.floor(j.length / 2)); }, 'half.jpg', /damaged or cut off/],
    ['a PDF named .png', async () => Buffer.from('%PDF-1.7\n1 0 obj\n<<>>\nendobj\n'), 'scan.png', /not an image Cagewright can read/],
  ])('refuses %s with 400 naming the file, together with a good one, and keeps nothing', async (_label, make, name, message) => {
    const before = await filesOnDisk();
    const res = await upload().attach('photos', await testJpeg(), 'good.jpg').attach('photos', await make(), name).expect(400);
    expect(res.body.error).toEqual(errorOf({
      code: 'validation_failed', message: 'Some files are not photos Cagewright can use. Nothing was saved.',
      details: [{ path: 'photos.1', message: expect.stringMatching(message) }],
    }));
    expect(res.body.error.details[0].message).toContain(`"${name}"`);
    expect(await filesOnDisk()).toEqual(before);
    expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}/photos`)).body.photos).toHaveLength(2);
  });

  it('refuses a file over 15 MB with 413', async () => {
    const big = Buffer.concat([await testJpeg(), Buffer.alloc(15 * 1024 * 1024)]);
    const res = await upload().attach('photos', big, 'huge.jpg').expect(413);
    expect(res.body.error).toEqual(errorOf({ code: 'payload_too_large', message: 'Each photo may be at most 15 MB. Nothing was saved.' }));
    expect(await filesOnDisk()).toHaveLength(4);
  });

  it('refuses more than 10 files in one upload', async () => {
    const jpeg = await testJpeg(64, 48);
    let req = upload();
    for (let i = 0; i < 11; i++) req = req.attach('photos', jpeg, `p${i}.jpg`);
    const res = await req.expect(400);
    expect(res.body.error.details).toEqual([{ path: 'photos', message: 'At most 10 photos per upload. Nothing was saved.' }]);
    expect(await filesOnDisk()).toHaveLength(4);
  });

  it('refuses an upload whose form is cut off before its end', async () => {
    const jpeg = await testJpeg(64, 48);
    const head = Buffer.from('--XBOUNDARY\r\nContent-Disposition: form-data; name="photos"; filename="a.jpg"\r\nContent-Type: image/jpeg\r\n\r\n');
    const res = await upload().set('Content-Type', 'multipart/form-data; boundary=XBOUNDARY').send(Buffer.concat([head, jpeg.subarray(0, 200)])).expect(400);
    expect(res.body.error.details).toEqual([{ path: 'photos', message: 'The upload was cut off or is not a well-formed form. Nothing was saved; please try again.' }]);
    expect(await filesOnDisk()).toHaveLength(4);
  });

  it('refuses no files, a member the sheet does not have, an unknown area, and mismatched field counts', async () => {
    const none = await upload().field('captions', 'x').expect(400);
    expect(none.body.error.details).toEqual([{ path: 'photos', message: 'Choose at least one photo.' }]);
    const jpeg = await testJpeg(64, 48);
    const member = await upload().attach('photos', jpeg, 'a.jpg').field('memberIds', 'door-9').field('areas', 'roof').expect(400);
    expect(member.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['photos.0.area', 'photos.0.memberId']);
    expect(member.body.error.details.find((d: { path: string }) => d.path === 'photos.0.memberId').message).toBe('No member of the latest revision has the id "door-9".');
    const counts = await upload().attach('photos', jpeg, 'a.jpg').attach('photos', jpeg, 'b.jpg').field('captions', 'only one').expect(400);
    expect(counts.body.error.details[0].path).toBe('captions');
    expect(await filesOnDisk()).toHaveLength(4);
  });

  it('removes the stored files again when the database refuses the rows', async () => {
    await db.ds.query(`CREATE FUNCTION cw_test_refuse_photo() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RAISE EXCEPTION 'refused for the test'; END $$`);
    await db.ds.query(`CREATE TRIGGER cw_test_refuse_photo BEFORE INSERT ON photos FOR EACH ROW EXECUTE FUNCTION cw_test_refuse_photo()`);
    try {
      const res = await upload().attach('photos', await testJpeg(), 'a.jpg').attach('photos', await testJpeg(), 'b.jpg').expect(500);
      expect(res.body).toEqual(errorBody({ error: { code: 'internal_error', message: 'Something went wrong on our side.' } }));
    } finally {
      await db.ds.query('DROP TRIGGER cw_test_refuse_photo ON photos');
      await db.ds.query('DROP FUNCTION cw_test_refuse_photo()');
    }
    expect(await filesOnDisk()).toHaveLength(4);
  });

  it('holds at most 60 photos per sheet (409), saying how many more fit', async () => {
    await db.ds.query(
      `INSERT INTO photos (build_sheet_id, area, storage_key, thumbnail_key, width_px, height_px, byte_size)
       SELECT $1, 'general', 'fake/' || g || '.jpg', 'fake/' || g || '.thumb.jpg', 10, 10, 10 FROM generate_series(1, 57) g`,
      [sheetId],
    );
    try {
      const jpeg = await testJpeg(64, 48);
      const res = await upload().attach('photos', jpeg, 'a.jpg').attach('photos', jpeg, 'b.jpg').expect(409);
      expect(res.body.error).toEqual(errorOf({
        code: 'conflict', message: 'A build sheet holds at most 60 photos. This one has 59, so at most 1 more can be added.', details: { limit: 60, current: 59 },
      }));
    } finally {
      await db.ds.query(`DELETE FROM photos WHERE storage_key LIKE 'fake/%'`);
    }
    expect(await filesOnDisk()).toHaveLength(4);
  });
});

describe('editing, deleting and who may see photos', () => {
  let photo: { id: string; imageUrl: string; thumbnailUrl: string };
  beforeAll(async () => {
    photo = (await who.builder.agent.get(`/api/build-sheets/${sheetId}/photos`)).body.photos[1];
  });

  it('edits a caption, member and area', async () => {
    const res = await who.builder.agent.patch(`/api/photos/${photo.id}`).set('X-CSRF-Token', who.builder.token)
      .send({ caption: 'Right foot plate, welded all round', memberId: 'fh', area: 'mounting' }).expect(200);
    expect(res.body.photo).toMatchObject({ caption: 'Right foot plate, welded all round', memberId: 'fh', area: 'mounting' });
    const bad = await who.builder.agent.patch(`/api/photos/${photo.id}`).set('X-CSRF-Token', who.builder.token).send({ memberId: 'zz' }).expect(400);
    expect(bad.body.error.details).toEqual([{ path: 'memberId', message: 'No member of the latest revision has the id "zz".' }]);
  });

  it.each(['steward', 'admin'] as const)('a club %s sees the photos but may not change them (403)', async (role) => {
    const { agent, token } = who[role];
    expect((await agent.get(`/api/build-sheets/${sheetId}/photos`).expect(200)).body.photos).toHaveLength(2);
    await agent.get(photo.imageUrl).expect(200).expect('Content-Type', 'image/jpeg');
    await agent.get(photo.thumbnailUrl).expect(200);
    await agent.patch(`/api/photos/${photo.id}`).set('X-CSRF-Token', token).send({ caption: 'x' }).expect(403);
    await agent.delete(`/api/photos/${photo.id}`).set('X-CSRF-Token', token).expect(403);
    await upload(who[role]).attach('photos', await testJpeg(64, 48), 'a.jpg').expect(403);
  });

  it.each(['otherBuilder', 'outsider'] as const)('the %s gets 404 for every photo route', async (role) => {
    const { agent, token } = who[role];
    const gone = { error: { code: 'not_found', message: 'Photo not found.' } };
    await agent.get(`/api/build-sheets/${sheetId}/photos`).expect(404);
    await agent.get(photo.imageUrl).expect(404).expect(hasErrorBody(gone));
    await agent.get(photo.thumbnailUrl).expect(404).expect(hasErrorBody(gone));
    await agent.patch(`/api/photos/${photo.id}`).set('X-CSRF-Token', token).send({ caption: 'x' }).expect(404).expect(hasErrorBody(gone));
    await agent.delete(`/api/photos/${photo.id}`).set('X-CSRF-Token', token).expect(404).expect(hasErrorBody(gone));
    await upload(who[role]).attach('photos', await testJpeg(64, 48), 'a.jpg').expect(404);
    expect(await filesOnDisk()).toHaveLength(4);
  });

  it('deletes a photo with its files', async () => {
    await who.builder.agent.delete(`/api/photos/${photo.id}`).set('X-CSRF-Token', who.builder.token).expect(204);
    await who.builder.agent.get(photo.imageUrl).expect(404);
    expect(await filesOnDisk()).toHaveLength(2);
    expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}/photos`)).body.photos).toHaveLength(1);
  });
});
