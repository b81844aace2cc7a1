// Shared helpers of the API tests: a DataSource per test file on the migrated test database, a clean
// demo seed before each file, apps built with createApp (never listening), sign-in with CSRF, and
// a TCP proxy that can cut the app off from PostgreSQL and reconnect it.
import { connect, createServer, type Server, type Socket } from 'node:net';
import type { Express } from 'express';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, expect, inject } from 'vitest';
import { closeApp, createApp, type CreateAppOptions } from '../../backend/src/app';
import { loadConfig, type Config } from '../../backend/src/config';
import { createDataSource } from '../../backend/src/db/data-source';
import { seedDemo } from '../../backend/src/db/seed';
import { demoPassword } from '../../backend/src/db/seed-data';
import type { S3StorageSettings } from '../../backend/src/services/photos/photo-storage';

export type Agent = ReturnType<typeof request.agent>;
export const testPublicUrl = 'http://cagewright.test';

export function testDatabaseUrl(): string {
  return inject('databaseUrl');
}

export function testConfig(env: NodeJS.ProcessEnv = {}): Config {
  return loadConfig({ NODE_ENV: 'test', DATABASE_URL: testDatabaseUrl(), PUBLIC_URL: testPublicUrl, ...env });
}

export async function openDataSource(databaseUrl = testDatabaseUrl()): Promise<DataSource> {
  const ds = createDataSource({ databaseUrl, poolSize: 4 });
  await ds.initialize();
  return ds;
}

/**
 * Empties every table the accounts schema owns (and what hangs off them), then seeds the demo. Jobs an
 * earlier file left in pg-boss's queue go too: they name rows that no longer exist, and a worker this
 * file starts would otherwise run them and write into this file's tables.
 */
export async function resetAndSeed(ds: DataSource): Promise<void> {
  await ds.query('TRUNCATE "session", "invitations", "memberships", "users", "clubs" CASCADE');
  await clearLimits(ds);
  if ((await ds.query(`SELECT to_regclass('pgboss.job') AS t`))[0].t) await ds.query('DELETE FROM pgboss.job');
  await seedDemo(ds);
}

/** Forgets every limit counter (they live in PostgreSQL and would carry over from an earlier test). */
export async function clearLimits(ds: DataSource): Promise<void> {
  await ds.query('DELETE FROM "rate_limits"');
}

interface TestDb {
  /** Available inside tests and hooks that run after beforeAll. */
  readonly ds: DataSource;
}

/** One DataSource for the test file, on a freshly seeded database; closed after the file. */
export function useTestDatabase(): TestDb {
  let ds: DataSource | undefined;
  beforeAll(async () => {
    ds = await openDataSource();
    await resetAndSeed(ds);
  });
  afterAll(async () => {
    await closeAllApps();
    await ds?.destroy();
  });
  return {
    get ds() {
      if (!ds) throw new Error('useTestDatabase: the DataSource opens in beforeAll');
      return ds;
    },
  };
}

const openApps: Express[] = [];
async function closeAllApps(): Promise<void> {
  while (openApps.length) await closeApp(openApps.pop()!);
}

export function makeTestApp(ds: DataSource, options: Partial<CreateAppOptions> = {}): Express {
  const app = createApp({ dataSource: ds, config: options.config ?? testConfig(), frontendDist: null, ...options });
  openApps.push(app);
  return app;
}

export async function csrfToken(agent: Agent): Promise<string> {
  const res = await agent.get('/api/auth/csrf').expect(200);
  const token: unknown = res.body.token;
  // A signed-in session's token (43 characters), or an anonymous caller's cookie-bound one (hmac.random).
  expect(token).toMatch(/^([A-Za-z0-9_-]{43}|[0-9a-f]{64}\.[0-9a-f]{64})$/);
  return token as string;
}

/** Signs the agent in (fetching a token first) and returns the fresh token of the new session. */
export async function signIn(agent: Agent, email: string, password = demoPassword): Promise<string> {
  const token = await csrfToken(agent);
  await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email, password }).expect(200);
  return csrfToken(agent);
}

const requestIdPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

/** An error body as the API sends it: the code, message and details given, and the request's id. */
export function errorBody(body: { error: object }): { error: object } {
  return { error: { ...body.error, requestId: expect.stringMatching(requestIdPattern) } };
}

/** The `error` member of errorBody, for `expect(res.body.error).toEqual(…)`. */
export function errorOf(error: object): object {
  return errorBody({ error }).error;
}

/** errorBody for supertest's `.expect(fn)` (its `.expect(status, body)` compares exactly, so it cannot match "any id"). */
export function hasErrorBody(body: { error: object }): (res: { body: unknown }) => void {
  return (res) => {
    expect(res.body).toEqual(errorBody(body));
  };
}

export function agentFor(app: Express): Agent {
  return request.agent(app);
}

export const demo = {
  builder: 'builder@tarnwick.example',
  steward: 'steward@tarnwick.example',
  admin: 'admin@tarnwick.example',
} as const;

export async function demoClubId(ds: DataSource): Promise<string> {
  const rows: { id: string }[] = await ds.query(`SELECT id FROM clubs WHERE slug = 'tarnwick-vale'`);
  return rows[0]!.id;
}

/**
 * A TCP proxy in front of PostgreSQL. `cut()` closes the port and drops every connection (as when
 * the server stops); `restore()` listens again on the same port.
 */
export interface DbProxy {
  port: number;
  url: string;
  cut(): Promise<void>;
  restore(): Promise<void>;
  close(): Promise<void>;
}

export async function startDbProxy(databaseUrl = testDatabaseUrl()): Promise<DbProxy> {
  const target = new URL(databaseUrl);
  const sockets = new Set<Socket>();
  let server: Server | undefined;
  let port = 0;

  const listen = () =>
    new Promise<void>((resolve, reject) => {
      const s = createServer((client) => {
        const upstream = connect(Number(target.port), target.hostname);
        sockets.add(client).add(upstream);
        const drop = () => {
          client.destroy();
          upstream.destroy();
          sockets.delete(client);
          sockets.delete(upstream);
        };
        client.on('error', drop).on('close', drop);
        upstream.on('error', drop).on('close', drop);
        client.pipe(upstream).pipe(client);
      });
      s.once('error', reject);
      s.listen(port, '127.0.0.1', () => {
        port = (s.address() as { port: number }).port;
        server = s;
        resolve();
      });
    });
  const cut = async () => {
    const s = server;
    server = undefined;
    for (const sock of sockets) sock.destroy();
    sockets.clear();
    if (s) await new Promise<void>((resolve) => s.close(() => resolve()));
  };

  await listen();
  const url = new URL(databaseUrl);
  url.port = String(port);
  return { port, url: url.toString(), cut, restore: listen, close: cut };
}

/** Settings for photos in the local S3 fake the global setup started, under a prefix of this test's own. */
export function fakeS3Settings(prefix = `t-${Math.random().toString(36).slice(2, 10)}/`): S3StorageSettings {
  const { endpoint, bucket } = inject('fakeS3');
  return { bucket, region: 'us-east-1', endpoint, forcePathStyle: true, credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' }, prefix };
}
