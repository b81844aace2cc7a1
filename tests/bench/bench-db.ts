// A fresh bench database in the test cluster, migrated and seeded with the demo, for the benches
// that need PostgreSQL. The caller owns the returned DataSource and destroys it.
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { Client } from 'pg';
import type { DataSource } from 'typeorm';

const root = fileURLToPath(new URL('../..', import.meta.url));

function pgScript(...args: string[]): string {
  return execFileSync('bash', [`${root}scripts/pg.sh`, ...args], { cwd: root, encoding: 'utf8' }).trim();
}

export async function freshSeededDatabase(name: string, poolSize: number): Promise<{ url: string; ds: DataSource }> {
  pgScript('start', '--test');
  const testUrl = pgScript('url', '--test');
  const admin = new Client({ connectionString: testUrl });
  await admin.connect();
  try {
    await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    await admin.query(`CREATE DATABASE ${name}`);
  } finally {
    await admin.end();
  }
  const url = new URL(testUrl);
  url.pathname = `/${name}`;
  const { createDataSource } = await import('../../backend/src/db/data-source');
  const { migrate } = await import('../../backend/src/db/migrate');
  const { seedDemo } = await import('../../backend/src/db/seed');
  const ds = createDataSource({ databaseUrl: url.toString(), poolSize });
  await ds.initialize();
  try {
    await migrate(ds);
    await seedDemo(ds);
  } catch (error) {
    await ds.destroy();
    throw error;
  }
  return { url: url.toString(), ds };
}
