// node-postgres pools whose every client has an 'error' listener from the moment it exists.
// A pooled client can emit 'error' (say "terminating connection due to administrator command" when
// PostgreSQL stops) while nobody listens: between its release and its next owner attaching a listener,
// or while pg-pool hands it out. An 'error' event with no listener ends the process, so a listener added
// per checkout is not enough. The client class below listens from its constructor; the pool still sees
// the error through its own listener and drops the client, and the next checkout reconnects.
// Every pool of the process is built with it: TypeORM's (createDataSource, `extra.Client`), which the
// session store shares, the health probe's and pg-boss's (createJobs).
import pg from 'pg';

export type PgErrorSink = (err: Error, source: string) => void;

/** A pg.Client class whose instances report their errors to `onError` instead of crashing. */
export function guardedClientClass(source: string, onError: PgErrorSink): typeof pg.Client {
  return class GuardedClient extends pg.Client {
    constructor(config?: string | pg.ClientConfig) {
      super(config);
      this.on('error', (err: Error) => onError(err, source));
    }
  };
}

/** A pg.Pool of guarded clients that also listens on the pool itself. */
export function createGuardedPool(source: string, config: pg.PoolConfig, onError: PgErrorSink): pg.Pool {
  const pool = new pg.Pool({ ...config, Client: guardedClientClass(source, onError) });
  pool.on('error', (err) => onError(err, source));
  return pool;
}
