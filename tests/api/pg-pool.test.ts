// Every pooled client listens for 'error' from the moment it exists (db/pg-pool.ts). A plain pg.Pool
// hands out clients with no listener at all: an owner that has not attached one yet (or one that forgot)
// ends the process when PostgreSQL terminates the connection. Here a client is checked out and its
// backend terminated while nobody listens; the error reaches the guard, the process carries on, and
// the pool serves the next query on a fresh connection.
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { createDataSource } from '../../backend/src/db/data-source';
import { createGuardedPool } from '../../backend/src/db/pg-pool';
import { testDatabaseUrl } from './helpers';

const pools: pg.Pool[] = [];
afterAll(async () => {
  await Promise.all(pools.map((p) => p.end().catch(() => undefined)));
});

async function terminate(pid: number): Promise<void> {
  const killer = new pg.Client({ connectionString: testDatabaseUrl() });
  await killer.connect();
  try {
    await killer.query('SELECT pg_terminate_backend($1)', [pid]);
  } finally {
    await killer.end();
  }
}

async function backendPid(client: pg.PoolClient): Promise<number> {
  return ((await client.query('SELECT pg_backend_pid() AS pid')).rows[0] as { pid: number }).pid;
}

describe('guarded pools', () => {
  it('a plain pg.Pool hands out a client with no error listener (what the guard is for)', async () => {
    const plain = new pg.Pool({ connectionString: testDatabaseUrl(), max: 1 });
    pools.push(plain);
    const client = await plain.connect();
    expect(client.listenerCount('error')).toBe(0);
    client.release();
  });

  it('reports an error on a checked-out client nobody listens to, and the pool recovers', async () => {
    const seen: string[] = [];
    const pool = createGuardedPool('test', { connectionString: testDatabaseUrl(), max: 1 }, (err, source) => seen.push(`${source}: ${err.message}`));
    pools.push(pool);
    const client = await pool.connect();
    expect(client.listenerCount('error')).toBeGreaterThan(0);
    const errored = new Promise<void>((resolve) => client.once('error', () => resolve()));
    await terminate(await backendPid(client));
    await errored;
    expect(seen.some((s) => s.startsWith('test: ') && /terminat/i.test(s))).toBe(true);
    client.release(new Error('terminated'));
    expect((await pool.query('SELECT 1 AS one')).rows[0]).toEqual({ one: 1 });
  });

  it('TypeORM’s pool (shared by the session store) is built from guarded clients', async () => {
    const ds = createDataSource({ databaseUrl: testDatabaseUrl(), poolSize: 1 });
    await ds.initialize();
    try {
      const master = (ds.driver as unknown as { master: pg.Pool }).master;
      const client = await master.connect();
      expect(client.listenerCount('error')).toBeGreaterThan(0);
      const errored = new Promise<void>((resolve) => client.once('error', () => resolve()));
      await terminate(await backendPid(client));
      await errored;
      client.release(new Error('terminated'));
      expect(await ds.query('SELECT 1 AS one')).toEqual([{ one: 1 }]);
    } finally {
      await ds.destroy();
    }
  });
});
