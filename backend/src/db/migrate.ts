// Runs pending migrations and prints what ran:   npx tsx backend/src/db/migrate.ts
// `--revert` undoes the latest one (for development only).
// Several servers may start at once against one database (more than one process or machine): the run
// holds a PostgreSQL advisory lock, so one of them migrates and the others then find nothing to do.
import pg from 'pg';
import { loadConfig } from '../config';
import { createDataSource } from './data-source';
import { isMainModule } from './main-module';
import type { DataSource } from 'typeorm';

/** Any number that names the lock; the same in every process. */
const migrationLockKey = 71_406_338;

/**
 * Runs every pending migration, each in its own transaction, while holding the migration lock (on a
 * connection of its own, so a pool of one still has its connection for the migrations); returns their names.
 */
export async function migrate(ds: DataSource): Promise<string[]> {
  const url = (ds.options as { url?: string }).url;
  const lock = new pg.Client({ connectionString: url, connectionTimeoutMillis: 5000, application_name: 'cagewright-migrate-lock' });
  // A dropped lock connection must not end the process (db/pg-pool.ts); the migrations report their own errors.
  lock.on('error', () => undefined);
  await lock.connect();
  try {
    await lock.query('SELECT pg_advisory_lock($1)', [migrationLockKey]);
    const ran = await ds.runMigrations({ transaction: 'each' });
    return ran.map((m) => m.name);
  } finally {
    await lock.query('SELECT pg_advisory_unlock($1)', [migrationLockKey]).catch(() => undefined);
    await lock.end().catch(() => undefined);
  }
}

if (isMainModule(import.meta.url)) {
  const config = loadConfig();
  const ds = createDataSource({ databaseUrl: config.databaseUrl, poolSize: 2 });
  try {
    await ds.initialize();
    if (process.argv.includes('--revert')) {
      await ds.undoLastMigration({ transaction: 'each' });
      console.log('Reverted the latest migration.');
    } else {
      const names = await migrate(ds);
      console.log(names.length ? `Ran ${names.length} migration(s):\n${names.map((n) => `  ${n}`).join('\n')}` : 'No pending migrations.');
    }
  } catch (err) {
    console.error('Migration failed:', err instanceof Error ? err.message : err);
    process.exitCode = 1;
  } finally {
    if (ds.isInitialized) await ds.destroy();
  }
}
