// Global setup of the API tests: start the shared test cluster, give it a fresh database, run the
// migrations once, and hand the URL to the test files (inject('databaseUrl') and DATABASE_URL). Also
// starts the local S3 fake (s3rver, backend/src/dev/fake-s3.ts) with a fresh bucket folder, for the
// tests of photos in object storage (inject('fakeS3')); each such test keeps its objects under a
// prefix of its own.
import { execFileSync } from 'node:child_process';
import { rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { TestProject } from 'vitest/node';
import { createDataSource } from '../../backend/src/db/data-source';
import { migrate } from '../../backend/src/db/migrate';
import { startFakeS3 } from '../../backend/src/dev/fake-s3';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
    fakeS3: { endpoint: string; bucket: string };
  }
}

const root = fileURLToPath(new URL('../..', import.meta.url));

function pgScript(...args: string[]): string {
  return execFileSync('bash', [resolve(root, 'scripts/pg.sh'), ...args], { cwd: root, encoding: 'utf8' }).trim();
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
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

  const s3Folder = resolve(root, '.data/fake-s3-test');
  rmSync(s3Folder, { recursive: true, force: true });
  const s3 = await startFakeS3({ directory: s3Folder, bucket: 'cagewright-test' });
  project.provide('fakeS3', { endpoint: s3.endpoint, bucket: s3.bucket });
  return async () => {
    await s3.stop();
    rmSync(s3Folder, { recursive: true, force: true });
  };
}
