// The TypeORM DataSource factory. Entities and migrations are listed explicitly and the schema is
// only ever changed by migrations (synchronize is always off).
import { DataSource } from 'typeorm';
import { entities } from '../entities';
import type { Logger } from '../logger';
import { migrations } from './migrations';
import { guardedClientClass } from './pg-pool';

export interface DataSourceOptions {
  databaseUrl: string;
  logger?: Logger;
  /** Pool size; the default suits one web process. */
  poolSize?: number;
}

export function createDataSource({ databaseUrl, logger, poolSize = 10 }: DataSourceOptions): DataSource {
  // Errors of a client with no owner at that moment (the pool reports them too, below) must never
  // reach an 'error' event without a listener: see db/pg-pool.ts.
  const onClientError = (err: Error) => logger?.debug('postgres client error', { err: err.message });
  return new DataSource({
    type: 'postgres',
    url: databaseUrl,
    entities,
    migrations,
    synchronize: false,
    migrationsRun: false,
    migrationsTableName: 'typeorm_migrations',
    // gen_random_uuid() is built into PostgreSQL 13+, so no extension has to be installed.
    uuidExtension: 'pgcrypto',
    installExtensions: false,
    connectTimeoutMS: 5000,
    extra: {
      max: poolSize,
      // Fail fast rather than queue forever when PostgreSQL is unreachable.
      connectionTimeoutMillis: 5000,
      idleTimeoutMillis: 30000,
      Client: guardedClientClass('app', onClientError),
    },
    // An idle client losing its server emits 'error' on the pool; unhandled, that would end the
    // process. Log it: the pool drops the client and the next checkout reconnects.
    poolErrorHandler: (err: unknown) => {
      logger?.warn('postgres pool error', { err: err instanceof Error ? err.message : String(err) });
    },
    logging: false,
  });
}
