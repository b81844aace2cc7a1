// Global setup of the API tests: start the shared test cluster, give it a fresh database, run the
// migrations once, and hand the URL to the test files (inject('databaseUrl') and DATABASE_URL).
import { execFileSync } from 'node:child_process';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { TestProject } from 'vitest/node';
import { createDataSource } from '../../backend/src/db/data-source';
import { migrate } from '../../backend/src/db/migrate';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
  }
}

const root = fileURLToPath(new URL('../..', import.meta.url));

function pgScript(...args: string[]): string {
  return execFileSync('bash', [resolve(root, 'scripts/pg.sh'), ...args], { cwd: root, encoding: 'utf8' }).trim();
}

export default async function setup(project: TestProject): Promise<void> {
  pgScript('start', '--test');
  pgScript('reset', '--test');
  const databaseUrl = pgScript('url', '--test');
  const ds = createDataSource({ databaseUrl, poolSize: 1 });
  await ds.initialize();
  try {
    await migrate(ds);
  } finally {
    await ds.destroy();
  }
  process.env.DATABASE_URL = databaseUrl;
  project.provide('databaseUrl', databaseUrl);
}
