// Backup and restore (scripts/backup.sh, npm run db:backup / db:restore): a backup of a database with a
// build sheet and an uploaded photo, restored into a fresh database and a fresh uploads folder, gives
// back every row of every table and every file byte for byte, and the restored server serves the photo.
// A restore from a file that is not a backup changes nothing.
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtemp, readFile, readdir, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeApp, createApp } from '../../backend/src/app';
import { migrate } from '../../backend/src/db/migrate';
import { seedDemo } from '../../backend/src/db/seed';
import { carWithSheet, everyone, garageFixture, testJpeg } from './garage-fixtures';
import { openDataSource, testConfig, testDatabaseUrl } from './helpers';

const run = promisify(execFile);
const script = resolve(__dirname, '../../scripts/backup.sh');
const source = 'cagewright_backup_source';
const target = 'cagewright_backup_target';

function urlOf(database: string): string {
  const url = new URL(testDatabaseUrl());
  url.pathname = `/${database}`;
  return url.toString();
}

async function admin(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: testDatabaseUrl() });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

function backupScript(args: string[], database: string, uploadDir: string) {
  return run('bash', [script, ...args], {
    env: { ...process.env, DATABASE_URL: urlOf(database), UPLOAD_DIR: uploadDir },
    encoding: 'utf8',
  });
}

/** Every table of every schema the app owns, with a digest of all its rows in a fixed order. */
async function fingerprint(database: string): Promise<Record<string, { rows: number; digest: string }>> {
  const client = new pg.Client({ connectionString: urlOf(database) });
  await client.connect();
  try {
    const tables = await client.query<{ name: string }>(
      `SELECT format('%I.%I', table_schema, table_name) AS name FROM information_schema.tables
       WHERE table_type = 'BASE TABLE' AND table_schema NOT IN ('pg_catalog', 'information_schema') ORDER BY 1`,
    );
    const out: Record<string, { rows: number; digest: string }> = {};
    for (const { name } of tables.rows) {
      const res = await client.query<{ rows: string; digest: string | null }>(
        `SELECT count(*) AS rows, md5(string_agg(t::text, E'\\n' ORDER BY t::text)) AS digest FROM ${name} t`,
      );
      out[name] = { rows: Number(res.rows[0]!.rows), digest: res.rows[0]!.digest ?? '' };
    }
    return out;
  } finally {
    await client.end();
  }
}

async function filesIn(dir: string): Promise<Record<string, string>> {
  const entries = await readdir(dir, { recursive: true, withFileTypes: true });
  const out: Record<string, string> = {};
  for (const e of entries.filter((x) => x.isFile())) {
    const path = join(e.parentPath, e.name);
    out[relative(dir, path)] = createHash('sha256').update(await readFile(path)).digest('hex');
  }
  return out;
}

let work: string;
let sourceUploads: string;
let imageUrl: string;

beforeAll(async () => {
  await admin(`DROP DATABASE IF EXISTS ${source} WITH (FORCE)`);
  await admin(`DROP DATABASE IF EXISTS ${target} WITH (FORCE)`);
  await admin(`CREATE DATABASE ${source}`);
  await admin(`CREATE DATABASE ${target}`);
  work = await mkdtemp(join(tmpdir(), 'cw-backup-'));
  sourceUploads = join(work, 'uploads-source');

  // A database with the demo, a car, a build sheet and one uploaded photo (with its thumbnail).
  const ds = await openDataSource(urlOf(source));
  await migrate(ds);
  await seedDemo(ds);
  const app = createApp({ dataSource: ds, config: testConfig({ DATABASE_URL: urlOf(source), UPLOAD_DIR: sourceUploads }), frontendDist: null });
  try {
    const fx = await garageFixture(ds);
    const who = await everyone(app);
    const { sheetId } = await carWithSheet(who.builder, fx);
    const res = await who.builder.agent
      .post(`/api/build-sheets/${sheetId}/photos`)
      .set('X-CSRF-Token', who.builder.token)
      .attach('photos', await testJpeg(), 'left-foot.jpg')
      .field('captions', 'Left foot before welding')
      .expect(201);
    imageUrl = res.body.photos[0].imageUrl;
  } finally {
    await closeApp(app);
    await ds.destroy();
  }
}, 120_000);

afterAll(async () => {
  await admin(`DROP DATABASE IF EXISTS ${source} WITH (FORCE)`);
  await admin(`DROP DATABASE IF EXISTS ${target} WITH (FORCE)`);
});

describe('npm run db:backup and db:restore', () => {
  it('restores every row and every photo into a fresh database and folder', async () => {
    const file = join(work, 'club.dump');
    await backupScript(['backup', file], source, sourceUploads);
    const sourceFiles = await filesIn(sourceUploads);
    expect(Object.keys(sourceFiles)).toHaveLength(2); // the photo and its thumbnail

    const targetUploads = join(work, 'uploads-target');
    await backupScript(['restore', file, '--yes'], target, targetUploads);

    const [before, after] = [await fingerprint(source), await fingerprint(target)];
    expect(Object.keys(after).sort()).toEqual(Object.keys(before).sort());
    expect(after).toEqual(before);
    expect(before['public.photos']?.rows).toBe(1);
    expect(before['public.build_sheets']?.rows).toBeGreaterThan(0);
    expect(await filesIn(targetUploads)).toEqual(sourceFiles);

    // The restored server serves the photo: the rows point at files that are really there.
    const ds = await openDataSource(urlOf(target));
    const app = createApp({ dataSource: ds, config: testConfig({ DATABASE_URL: urlOf(target), UPLOAD_DIR: targetUploads }), frontendDist: null });
    try {
      const who = await everyone(app);
      const image = await who.builder.agent.get(imageUrl).buffer(true).expect(200);
      expect(image.headers['content-type']).toBe('image/jpeg');
    } finally {
      await closeApp(app);
      await ds.destroy();
    }
  }, 120_000);

  it('refuses a restore from a file that is not a backup and changes nothing', async () => {
    const bogus = join(work, 'not-a-backup.dump');
    await writeFile(bogus, 'hello');
    await writeFile(join(work, 'not-a-backup.uploads.tar.gz'), 'hello');
    const targetUploads = join(work, 'uploads-target');
    const [rowsBefore, filesBefore] = [await fingerprint(target), await filesIn(targetUploads)];
    await expect(backupScript(['restore', bogus, '--yes'], target, targetUploads)).rejects.toMatchObject({
      stderr: expect.stringContaining('is not a database backup'),
    });
    expect(await fingerprint(target)).toEqual(rowsBefore);
    expect(await filesIn(targetUploads)).toEqual(filesBefore);
  }, 60_000);

  it('asks for --yes when there is nobody to confirm, and never overwrites a backup', async () => {
    const file = join(work, 'club.dump');
    await expect(backupScript(['restore', file], target, join(work, 'uploads-target'))).rejects.toMatchObject({
      stderr: expect.stringContaining('--yes'),
    });
    await expect(backupScript(['backup', file], source, sourceUploads)).rejects.toMatchObject({
      stderr: expect.stringContaining('exists already'),
    });
  }, 60_000);
});
