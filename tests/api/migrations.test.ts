// Entities and migrations must not drift: on a fresh database, after the migrations, TypeORM's schema
// builder must find nothing to change (the equivalent of `migration:generate --check`). The
// migrations must also revert cleanly, and servers starting at once migrate one at a time.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { migrate } from '../../backend/src/db/migrate';
import { migrations } from '../../backend/src/db/migrations';
import { openDataSource, testDatabaseUrl } from './helpers';

const scratchDb = 'cw_api_migration_check';
let admin: DataSource;
let ds: DataSource;

beforeAll(async () => {
  admin = await openDataSource();
  await admin.query(`DROP DATABASE IF EXISTS ${scratchDb} WITH (FORCE)`);
  await admin.query(`CREATE DATABASE ${scratchDb}`);
  const url = new URL(testDatabaseUrl());
  url.pathname = `/${scratchDb}`;
  ds = await openDataSource(url.toString());
});

afterAll(async () => {
  await ds?.destroy();
  await admin.query(`DROP DATABASE IF EXISTS ${scratchDb} WITH (FORCE)`);
  await admin.destroy();
});

describe('migrations', () => {
  it('run on an empty database and leave no difference to the entities', async () => {
    expect(await migrate(ds)).toEqual(migrations.map((m) => m.name));
    const log = await ds.driver.createSchemaBuilder().log();
    expect(log.upQueries.map((q) => q.query)).toEqual([]);
    expect(await migrate(ds)).toEqual([]);
  });

  it('create the session table connect-pg-simple expects', async () => {
    const cols = await ds.query(
      `SELECT column_name, data_type FROM information_schema.columns WHERE table_name = 'session' ORDER BY ordinal_position`,
    );
    expect(cols).toEqual([
      { column_name: 'sid', data_type: 'character varying' },
      { column_name: 'sess', data_type: 'json' },
      { column_name: 'expire', data_type: 'timestamp without time zone' },
    ]);
  });

  it('revert to an empty schema and apply again', async () => {
    for (let i = 0; i < migrations.length; i++) await ds.undoLastMigration({ transaction: 'each' });
    const tables: { table_name: string }[] = await ds.query(
      `SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_name <> 'typeorm_migrations'`,
    );
    expect(tables).toEqual([]);
    await migrate(ds);
    expect((await ds.driver.createSchemaBuilder().log()).upQueries).toEqual([]);
  });

  it('run once when three servers start at the same moment (the migration lock)', async () => {
    for (let i = 0; i < migrations.length; i++) await ds.undoLastMigration({ transaction: 'each' });
    const url = new URL(testDatabaseUrl());
    url.pathname = `/${scratchDb}`;
    // Pools of one, as the global setup uses: the lock must not take the migrations' connection.
    const servers = await Promise.all([1, 2, 3].map(async () => {
      const { createDataSource } = await import('../../backend/src/db/data-source');
      const one = createDataSource({ databaseUrl: url.toString(), poolSize: 1 });
      return one.initialize();
    }));
    try {
      const ran = await Promise.all(servers.map((s) => migrate(s)));
      // One server ran them all; the others waited for the lock and found nothing to do.
      expect(ran.map((r) => r.length).sort((a, b) => a - b)).toEqual([0, 0, migrations.length]);
      const rows: { n: number }[] = await ds.query(`SELECT count(*)::int AS n FROM typeorm_migrations`);
      expect(rows[0]!.n).toBe(migrations.length);
    } finally {
      await Promise.all(servers.map((s) => s.destroy()));
    }
  });
});
