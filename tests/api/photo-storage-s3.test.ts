// Photos in S3-compatible object storage (PHOTO_STORAGE=s3) against the local fake the global setup
// started (s3rver): the storage contract (put, get, remove, a missing object, a bad key, a bucket that
// is not there, a store that does not answer), and the photo routes on it: an upload lands in the
// bucket under the configured prefix and nowhere on disk, is served back, and is removed with its
// photo; an object gone from the bucket is a 404 that says so; a store that is down is a clean 503 and
// saves nothing.
import { ListObjectsV2Command, DeleteObjectCommand } from '@aws-sdk/client-s3';
import sharp from 'sharp';
import { beforeAll, describe, expect, it } from 'vitest';
import { PhotoStorageUnavailableError, StoredObjectMissingError } from '../../backend/src/services/photos/photo-storage';
import { S3PhotoStorage } from '../../backend/src/services/photos/s3-photo-storage';
import { fakeS3Settings, makeTestApp, testConfig, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, testJpeg, type SignedIn } from './garage-fixtures';
import { freePort } from './support/processes';

const db = useTestDatabase();

async function keysUnder(storage: S3PhotoStorage, bucket: string, prefix: string): Promise<string[]> {
  const out = await storage.client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix }));
  return (out.Contents ?? []).map((o) => o.Key!.slice(prefix.length)).sort();
}

describe('S3PhotoStorage on the local fake', () => {
  it('stores, reads back and removes bytes under its prefix', async () => {
    const settings = fakeS3Settings();
    const storage = new S3PhotoStorage(settings);
    await storage.check();
    await storage.put('sheets/abc/photo-1.jpg', Buffer.from('jpeg bytes'));
    expect((await storage.get('sheets/abc/photo-1.jpg')).toString()).toBe('jpeg bytes');
    expect(await keysUnder(storage, settings.bucket, settings.prefix)).toEqual(['sheets/abc/photo-1.jpg']);
    await storage.remove('sheets/abc/photo-1.jpg');
    await expect(storage.get('sheets/abc/photo-1.jpg')).rejects.toBeInstanceOf(StoredObjectMissingError);
    // Removing what is not there is not an error (a retried delete, a photo removed twice).
    await expect(storage.remove('sheets/abc/photo-1.jpg')).resolves.toBeUndefined();
    expect(await keysUnder(storage, settings.bucket, settings.prefix)).toEqual([]);
  });

  it.each(['../escape.jpg', '/etc/passwd', 'a/../../b.jpg', 'name with spaces.jpg'])('refuses the key %s', async (key) => {
    await expect(new S3PhotoStorage(fakeS3Settings()).put(key, Buffer.from('x'))).rejects.toThrow(/Invalid storage key/);
  });

  it('says at start-up that a bucket does not exist', async () => {
    const storage = new S3PhotoStorage({ ...fakeS3Settings(), bucket: 'no-such-bucket' });
    await expect(storage.check()).rejects.toThrow('Photo storage: bucket "no-such-bucket" cannot be used (it does not exist).');
  });

  it('turns a store that does not answer into a 503, never a database error', async () => {
    const storage = new S3PhotoStorage({ ...fakeS3Settings(), endpoint: `http://127.0.0.1:${await freePort()}` });
    const err = await storage.put('sheets/x/y.jpg', Buffer.from('x')).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(PhotoStorageUnavailableError);
    expect(err).toMatchObject({ status: 503, code: 'storage_unavailable' });
    await expect(storage.get('sheets/x/y.jpg')).rejects.toBeInstanceOf(PhotoStorageUnavailableError);
  });
});

describe('the photo routes with PHOTO_STORAGE=s3', () => {
  const settings = fakeS3Settings();
  const probe = new S3PhotoStorage(settings);
  let who: Awaited<ReturnType<typeof everyone>>;
  let sheetId: string;
  let fx: Awaited<ReturnType<typeof garageFixture>>;

  const s3Env = (endpoint = settings.endpoint!) => ({
    PHOTO_STORAGE: 's3', S3_BUCKET: settings.bucket, S3_ENDPOINT: endpoint, S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_PREFIX: settings.prefix,
    // A folder nobody may use: a photo written to disk by mistake would fail the upload.
    UPLOAD_DIR: '/proc/cagewright-photos-must-not-be-here',
  });

  const upload = (as: SignedIn) => as.agent.post(`/api/build-sheets/${sheetId}/photos`).set('X-CSRF-Token', as.token);

  beforeAll(async () => {
    const app = makeTestApp(db.ds, { config: testConfig(s3Env()) });
    fx = await garageFixture(db.ds);
    who = await everyone(app);
    ({ sheetId } = await carWithSheet(who.builder, fx));
  });

  it('keeps the photo and its thumbnail in the bucket, serves them, and removes them with the photo', async () => {
    const res = await upload(who.builder).attach('photos', await testJpeg(800, 600), 'hoop.jpg').field('captions', 'Main hoop foot').expect(201);
    const [photo] = res.body.photos as { id: string; imageUrl: string; thumbnailUrl: string }[];
    expect(await keysUnder(probe, settings.bucket, settings.prefix)).toEqual([`sheets/${sheetId}/${photo!.id}.jpg`, `sheets/${sheetId}/${photo!.id}.thumb.jpg`]);

    const image = await who.builder.agent.get(photo!.imageUrl).buffer(true).expect(200);
    expect(image.headers['content-type']).toBe('image/jpeg');
    const meta = await sharp(image.body as Buffer).metadata();
    expect([meta.format, meta.width, meta.height, meta.exif]).toEqual(['jpeg', 800, 600, undefined]);
    // A steward of the club reads it too (from the same bucket, whichever server answers).
    await who.steward.agent.get(photo!.thumbnailUrl).expect(200);

    await who.builder.agent.delete(`/api/photos/${photo!.id}`).set('X-CSRF-Token', who.builder.token).expect(204);
    expect(await keysUnder(probe, settings.bucket, settings.prefix)).toEqual([]);
  });

  it('answers 404 with a plain message when the object is gone from the bucket', async () => {
    const res = await upload(who.builder).attach('photos', await testJpeg(), 'a.jpg').expect(201);
    const [photo] = res.body.photos as { id: string; imageUrl: string }[];
    await probe.client.send(new DeleteObjectCommand({ Bucket: settings.bucket, Key: `${settings.prefix}sheets/${sheetId}/${photo!.id}.jpg` }));
    const gone = await who.builder.agent.get(photo!.imageUrl).expect(404);
    expect(gone.body).toEqual({ error: { code: 'not_found', message: 'This photo’s file is missing from photo storage.', requestId: expect.any(String) } });
  });

  it('answers 503 storage_unavailable when the store is down, and saves nothing', async () => {
    const down = makeTestApp(db.ds, { config: testConfig(s3Env(`http://127.0.0.1:${await freePort()}`)) });
    const builder = (await everyone(down)).builder;
    const before: { n: number }[] = await db.ds.query(`SELECT count(*)::int AS n FROM photos WHERE build_sheet_id = $1`, [sheetId]);
    const res = await builder.agent.post(`/api/build-sheets/${sheetId}/photos`).set('X-CSRF-Token', builder.token).attach('photos', await testJpeg(), 'b.jpg').expect(503);
    expect(res.body.error.code).toBe('storage_unavailable');
    const after: { n: number }[] = await db.ds.query(`SELECT count(*)::int AS n FROM photos WHERE build_sheet_id = $1`, [sheetId]);
    expect(after[0]!.n).toBe(before[0]!.n);
  });
});
