// GET /api/health: the process answers, and says whether PostgreSQL does.
import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { publicRoute } from '../middleware/guards';
import { mountRoutes, route } from './route-table';

const probeTimeoutMs = 3000;

export async function databaseIsUp(ds: DataSource): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), probeTimeoutMs);
  });
  try {
    return await Promise.race([ds.query('SELECT 1').then(() => true), timeout]);
  } catch {
    return false;
  } finally {
    clearTimeout(timer);
  }
}

export function createHealthRouter(ds: DataSource): Router {
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/health',
      guards: [publicRoute],
      handler: async ({ res }) => {
        const up = await databaseIsUp(ds);
        res.set('Cache-Control', 'no-store');
        res.status(up ? 200 : 503).json(up ? { status: 'ok', db: 'up' } : { status: 'degraded', db: 'down' });
      },
    }),
  ]);
}
