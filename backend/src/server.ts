// The process entry point:   node --import tsx backend/src/server.ts
// Parses configuration, waits for PostgreSQL, runs pending migrations, then listens. SIGTERM and
// SIGINT stop taking connections, let requests in flight finish, and close the database cleanly.
// Background work runs here too (docs/mail-and-jobs.md): the fake SMTP server when FAKE_SMTP is on, the
// outbox dispatcher when SMTP_URL is known, the pg-boss job workers (with the hourly cage-record expiry
// reminder on pg-boss's cron), and the edition clock that brings scheduled rulebook editions into force
// on their date.
// Under `npm start` with SERVER_PROCESSES above 1 this file runs once per process as a node:cluster
// worker (supervisor.ts): only the first process runs the fake SMTP server (one port), the others send
// to it; everything else runs in each process and is safe to (docs/decisions/0012-more-than-one-server.md).
import cluster from 'node:cluster';
import { createServer } from 'node:http';
import type { DataSource } from 'typeorm';
import { closeApp, createApp } from './app';
import { ConfigError, loadConfig, type Config } from './config';
import { loadDotEnv } from './dotenv';
import { createDataSource } from './db/data-source';
import { migrate } from './db/migrate';
import { startFakeSmtp, type FakeSmtp } from './dev/fake-smtp';
import { createLogger, errorFields, type Logger } from './logger';
import { createMailboxService, createSmtpTransport, startOutboxDispatcher, type OutboxDispatcher } from './services/mail';
import { createJobs } from './services/jobs';
import { createServices } from './services';
import { createPhotoStorage } from './services/photos/storage';
import { registerImpactWorker } from './services/publish/impact-job';
import { registerRepublishWorker } from './services/publish/republish-job';
import { startEditionClock } from './services/publish/edition-clock';
import { registerExpiryReminders } from './services/records/expiry-reminder-job';
import { exitCodeConfig } from './supervisor';

function readConfig(): Config {
  try {
    return loadConfig();
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(err.message);
      // The supervisor does not restart a server that refuses its configuration.
      process.exit(exitCodeConfig);
    }
    throw err;
  }
}

/** PostgreSQL may still be starting (a supervisor starting both at once): retry for about 30 s. */
async function connect(ds: DataSource, logger: Logger, attempts = 30): Promise<void> {
  for (let i = 1; ; i++) {
    try {
      await ds.initialize();
      return;
    } catch (err) {
      if (i >= attempts) throw err;
      logger.warn('database not reachable yet, retrying', { attempt: i, ...errorFields(err), stack: undefined });
      await new Promise((r) => setTimeout(r, 1000));
    }
  }
}

loadDotEnv();
const config = readConfig();
const logger = createLogger(config.logLevel);
// 0 … n−1 under the cluster supervisor (kept across a process's restarts); 0 when run alone.
const processIndex = Number(process.env.CAGEWRIGHT_PROCESS_INDEX ?? 0);
process.on('unhandledRejection', (err) => logger.error('unhandled rejection', errorFields(err)));

const dataSource = createDataSource({ databaseUrl: config.databaseUrl, logger });
try {
  await connect(dataSource, logger);
  const ran = await migrate(dataSource);
  logger.info(ran.length ? 'migrations ran' : 'schema up to date', { migrations: ran });
} catch (err) {
  logger.error('cannot start: database unavailable or migration failed', errorFields(err));
  process.exit(1);
}

const photoStorage = createPhotoStorage(config.photoStorage);
try {
  await photoStorage.check?.();
} catch (err) {
  logger.error('cannot start: photo storage unusable', errorFields(err));
  process.exit(1);
}

let fakeSmtp: FakeSmtp | null = null;
if (config.fakeSmtp && config.smtpUrl && processIndex === 0) {
  const port = Number(new URL(config.smtpUrl).port);
  try {
    fakeSmtp = await startFakeSmtp({ store: createMailboxService(dataSource).store, port, logger });
  } catch (err) {
    logger.error('cannot start the fake SMTP server; set SMTP_URL to a free port, or FAKE_SMTP=false', { port, ...errorFields(err) });
    process.exit(1);
  }
}
let dispatcher: OutboxDispatcher | null = null;
if (config.smtpUrl) {
  dispatcher = startOutboxDispatcher({ dataSource, transport: createSmtpTransport(config.smtpUrl), from: config.mailFrom, logger });
} else {
  logger.warn('SMTP_URL is not set: e-mails wait in the outbox until it is');
}
const jobs = createJobs(config, logger, { staleAfterSeconds: config.jobStaleAfterSeconds, cron: true });
try {
  await jobs.start();
} catch (err) {
  logger.error('cannot start the job queue', errorFields(err));
  process.exit(1);
}

// One set of services for the app and the publish job, so both share the compiled-ruleset cache.
const services = createServices(dataSource, { publicUrl: config.publicUrl, photoStorage, recheckWorkers: config.recheckWorkers, recheckBatchSize: config.recheckBatchSize });
// Both re-checks run in the check service's bulk pool of worker threads (RECHECK_WORKERS).
await registerRepublishWorker(jobs, { ds: dataSource, evaluator: services.checks.bulk, mail: services.mail, audit: services.audit, publicUrl: config.publicUrl, batchSize: config.recheckBatchSize });
await registerImpactWorker(jobs, { rulebookAdmin: services.rulebookAdmin });
// Builders hear once, 30 days ahead, that their cage record expires (hourly, on pg-boss's cron).
await registerExpiryReminders(jobs, { recordBook: services.recordBook });
// Every process runs the clock: each round locks the rulebooks it moves (docs/decisions/0014).
const editionClock = startEditionClock(() => services.rulebookAdmin.activateDueEditions(), logger);
const app = createApp({ dataSource, config, logger, services, republishQueue: jobs, jobControl: jobs });
const server = createServer(app);
server.keepAliveTimeout = 5000;
server.on('error', (err) => {
  logger.error('cannot listen', { host: config.host, port: config.port, ...errorFields(err) });
  process.exit(1);
});
server.listen(config.port, config.host, () => {
  logger.info('listening', {
    url: `http://${config.host}:${config.port}`, publicUrl: config.publicUrl, env: config.nodeEnv, photos: config.photoStorage.kind,
    ...(cluster.isWorker ? { process: `${processIndex + 1} of ${process.env.CAGEWRIGHT_PROCESS_COUNT ?? '?'}` } : {}),
  });
});

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) {
    logger.warn('second signal, exiting now', { signal });
    process.exit(1);
  }
  stopping = true;
  logger.info('shutting down', { signal });
  // Idle keep-alive sockets would hold close() open; requests in flight get 10 s to finish.
  server.closeIdleConnections();
  const force = setTimeout(() => server.closeAllConnections(), 10_000);
  force.unref();
  await new Promise<void>((resolve) => server.close(() => resolve()));
  // Jobs first: a running re-check finishes its page (or is handed back for a retry) while the check
  // workers it uses are still there.
  await jobs.stop();
  await closeApp(app);
  editionClock.stop();
  await dispatcher?.stop();
  await fakeSmtp?.stop();
  await dataSource.destroy();
  logger.info('stopped');
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
// A cluster worker shares the terminal's process group: Ctrl-C reaches it directly and again through
// the primary (as SIGTERM). It waits for the primary's word, so one Ctrl-C is one graceful stop.
process.on('SIGINT', () => (cluster.isWorker ? logger.debug('SIGINT left to the cluster primary') : void shutdown('SIGINT')));
