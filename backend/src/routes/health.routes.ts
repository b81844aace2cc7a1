// GET /api/health: the process answers, and says whether PostgreSQL does.
// The probe has a connection of its own: under load the app's pool has a queue, and a probe that
// waited in it would measure the queue, not the database (the bench saw p99 go from ~30 to ~260 ms).
import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { createGuardedPool } from '../db/pg-pool';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

const probeTimeoutMs = 3000;

export interface HealthProbe {
  databaseIsUp(): Promise<boolean>;
  close(): Promise<void>;
}

export function createHealthProbe(ds: DataSource): HealthProbe {
  const url = (ds.options as { url?: string }).url;
  // A dropped connection is reported to the listener (nothing to do: the next probe reconnects).
  const pool = createGuardedPool(
    'health',
    { connectionString: url, max: 1, connectionTimeoutMillis: probeTimeoutMs, idleTimeoutMillis: 60_000, allowExitOnIdle: true },
    () => undefined,
  );
  return {
    async databaseIsUp() {
      let timer: NodeJS.Timeout | undefined;
      const timeout = new Promise<false>((resolve) => {
        timer = setTimeout(() => resolve(false), probeTimeoutMs);
      });
      try {
        return await Promise.race([pool.query('SELECT 1').then(() => true), timeout]);
      } catch {
        return false;
      } finally {
        clearTimeout(timer);
      }
    },
    close: () => pool.end(),
  };
}

export function createHealthRouter(probe: HealthProbe): RouteTableRouter {
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/health',
      access: 'public',
      handler: async ({ res }) => {
        const up = await probe.databaseIsUp();
        res.set('Cache-Control', 'no-store');
        res.status(up ? 200 : 503).json(up ? { status: 'ok', db: 'up' } : { status: 'degraded', db: 'down' });
      },
    }),
  ]);
}
