// Runs pending migrations and prints what ran:   npx tsx backend/src/db/migrate.ts
// `--revert` undoes the latest one (for development only).
import { loadConfig } from '../config';
import { createDataSource } from './data-source';
import { isMainModule } from './main-module';
import type { DataSource } from 'typeorm';

/** Runs every pending migration, each in its own transaction; returns their names. */
export async function migrate(ds: DataSource): Promise<string[]> {
  const ran = await ds.runMigrations({ transaction: 'each' });
  return ran.map((m) => m.name);
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
