// Entities and migrations must not drift: on a fresh database, after the migrations, TypeORM's schema
// builder must find nothing to change (the equivalent of `migration:generate --check`). The
// migrations must also revert cleanly.
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
});
