// Global setup of the browser tests: a real server on its own port, against a database of its own in the
// test cluster, migrated and seeded with the demo exactly as `npm start` does it. Torn down afterwards.
// The base URL reaches the tests through `inject('e2eBaseUrl')`.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    e2eBaseUrl: string;
    e2eSmtpPort: number;
    /** The server's database, for the few journeys that must move a clock (a link an hour old). */
    e2eDatabaseUrl: string;
  }
}

const root = fileURLToPath(new URL('../..', import.meta.url));
const port = Number(process.env.E2E_PORT ?? 3999);
// One database per port, so two runs on different ports never drop each other's data.
const databaseName = process.env.E2E_DB_NAME ?? (port === 3999 ? 'cagewright_e2e' : `cagewright_e2e_${port}`);
const baseUrl = `http://127.0.0.1:${port}`;
const smtpPort = Number(process.env.E2E_SMTP_PORT ?? port + 1000);

function pgScript(...args: string[]): string {
  return execFileSync('bash', [resolve(root, 'scripts/pg.sh'), ...args], {
    cwd: root,
    encoding: 'utf8',
  }).trim();
}

function clusterRunning(): boolean {
  try {
    pgScript('status', '--test');
    return true;
  } catch {
    return false;
  }
}

async function adminQuery(testUrl: string, sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: testUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

/** Runs one of the server's own scripts (migrate, seed) against the e2e database. */
function runBackendScript(script: string, env: NodeJS.ProcessEnv): void {
  execFileSync(process.execPath, ['--import', 'tsx', script], {
    cwd: root,
    env,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
}

async function answers(url: string): Promise<boolean> {
  try {
    await fetch(url);
    return true;
  } catch {
    return false;
  }
}

async function waitForHealth(server: ChildProcess, output: () => string, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (server.exitCode !== null)
      throw new Error(`The e2e server exited with ${server.exitCode}:\n${output()}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`The e2e server did not answer ${baseUrl}/api/health within ${timeoutMs} ms:\n${output()}`);
}

function stopServer(server: ChildProcess): Promise<void> {
  if (server.exitCode !== null || server.signalCode !== null) return Promise.resolve();
  return new Promise((done) => {
    const force = setTimeout(() => server.kill('SIGKILL'), 10_000);
    server.once('exit', () => {
      clearTimeout(force);
      done();
    });
    server.kill('SIGTERM');
  });
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  // npm test starts the cluster; a bare `npx vitest --project e2e` may not have, so start (and later stop) it.
  // A server already on the port (another run of these tests, say) would answer for ours: stop before
  // touching its database.
  if (await answers(`${baseUrl}/api/health`)) {
    throw new Error(
      `${baseUrl} is already in use (another e2e run?); stop it or set E2E_PORT to a free port.`,
    );
  }
  const startedCluster = !clusterRunning();
  if (startedCluster) pgScript('start', '--test');
  const testUrl = pgScript('url', '--test');
  const url = new URL(testUrl);
  url.pathname = `/${databaseName}`;
  const databaseUrl = url.toString();

  await adminQuery(testUrl, `drop database if exists ${databaseName} with (force)`);
  await adminQuery(testUrl, `create database ${databaseName}`);

  // Production mode, as a deployment runs it, with a secret of its own and only warnings logged.
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: databaseUrl,
    PORT: String(port),
    HOST: '127.0.0.1',
    PUBLIC_URL: baseUrl,
    SESSION_SECRET: randomBytes(32).toString('base64url'),
    LOG_LEVEL: 'warn',
    UPLOAD_DIR: resolve(root, '.artifacts/e2e-uploads'),
    // The server runs its fake SMTP server on a port of its own, so journeys can read the mail it sends.
    FAKE_SMTP: 'true',
    // A developer's own .env must not reach the server under test.
    CAGEWRIGHT_DOTENV: 'off',
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
  };
  runBackendScript('backend/src/db/migrate.ts', env);
  runBackendScript('backend/src/db/seed.ts', env);

  // npm test has built the front end already; a bare run may not have.
  if (!existsSync(resolve(root, 'frontend/dist/index.html'))) {
    execFileSync(
      process.execPath,
      ['node_modules/vite/bin/vite.js', 'build', '--config', 'frontend/vite.config.ts', '--logLevel', 'warn'],
      {
        cwd: root,
        stdio: ['ignore', 'inherit', 'inherit'],
      },
    );
  }

  let log = '';
  const server = spawn(process.execPath, ['--import', 'tsx', 'backend/src/server.ts'], {
    cwd: root,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const collect = (chunk: Buffer) => {
    log = (log + chunk.toString()).slice(-20_000);
  };
  server.stdout?.on('data', collect);
  server.stderr?.on('data', collect);

  const teardown = async () => {
    await stopServer(server);
    await adminQuery(testUrl, `drop database if exists ${databaseName} with (force)`).catch(() => undefined);
    if (startedCluster) pgScript('stop', '--test');
  };

  try {
    await waitForHealth(server, () => log, 60_000);
  } catch (err) {
    await teardown();
    throw err;
  }
  project.provide('e2eBaseUrl', baseUrl);
  project.provide('e2eSmtpPort', smtpPort);
  project.provide('e2eDatabaseUrl', databaseUrl);
  return teardown;
}
