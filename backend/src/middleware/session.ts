// Sessions in PostgreSQL (connect-pg-simple) on the DataSource's own pool, and passport on top.
// The cookie is `cw.sid`: httpOnly, sameSite lax, and secure whenever the request came over TLS
// (as Express sees it through TRUST_PROXY).
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Pool } from 'pg';
import type { DataSource } from 'typeorm';
import type { Logger } from '../logger';
import type { Services } from '../services';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace -- Express's own augmentation point
  namespace Express {
    interface User {
      id: string;
    }
  }
}

export const sessionCookieName = 'cw.sid';
export const sessionMaxAgeMs = 14 * 24 * 60 * 60 * 1000;

export interface SessionSetup {
  middleware: ReturnType<typeof session>;
  store: session.Store & { close(): Promise<void> | void };
}

export function createSessionMiddleware(opts: {
  dataSource: DataSource;
  secret: string;
  logger: Logger;
  /** Delete expired sessions every 15 minutes; off in tests, where the timer would keep them alive. */
  pruneSessions: boolean;
}): SessionSetup {
  // TypeORM keeps its node-postgres pool as `driver.master`; its type there is `any`.
  const pool = (opts.dataSource.driver as unknown as { master: Pool }).master;
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool,
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: opts.pruneSessions ? 15 * 60 : false,
    errorLog: (...args: unknown[]) => opts.logger.warn('session store error', { err: args.map(String).join(' ') }),
  });
  const middleware = session({
    name: sessionCookieName,
    secret: opts.secret,
    store,
    resave: false,
    saveUninitialized: false,
    cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: sessionMaxAgeMs },
  });
  return { middleware, store };
}

/** A passport instance of our own (not the global one), so several apps can live in one process. */
export function createPassport(services: Services): passport.PassportStatic {
  const instance = new passport.Passport() as passport.PassportStatic;
  instance.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      services.accounts.verifyCredentials(email, password).then((user) => done(null, user ?? false), done);
    }),
  );
  instance.serializeUser((user, done) => done(null, user.id));
  instance.deserializeUser((id: string, done) => {
    // A user deleted since sign-in simply ends up signed out (false), not an error.
    services.accounts.findById(id).then((user) => done(null, user ? { id: user.id } : false), done);
  });
  return instance;
}
