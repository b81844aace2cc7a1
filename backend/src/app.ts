// createApp builds the Express application and never listens (server.ts does), so tests can drive
// it with supertest. Order matters: the request log (an id for every request), security headers,
// health (no session, so it answers even when the session store cannot), JSON body, session +
// passport, cookies + CSRF, the route tables (collected for /api/openapi.json), the JSON 404 for /api,
// the front-end build with its SPA fallback, and finally the one error handler.
// Limits (services/limits) count in PostgreSQL, so every server process on one database shares them.
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import { projectRoot, type Config } from './config';
import { createLogger, type Logger } from './logger';
import { createCsrfProtection } from './middleware/csrf';
import { createRequestLog } from './middleware/request-log';
import { refuseUnsafeInput } from './middleware/safe-input';
import { apiNotFound, createErrorHandler } from './middleware/error-handler';
import { createPassport, createSessionMiddleware, type SessionSetup } from './middleware/session';
import { createAccountRouter } from './routes/account.routes';
import { createAuthRouter } from './routes/auth.routes';
import { createPasswordResetRouter } from './routes/password-reset.routes';
import { createBuildSheetsRouter } from './routes/build-sheets.routes';
import { createCarsRouter } from './routes/cars.routes';
import { createCarTransfersRouter } from './routes/car-transfers.routes';
import { createCheckRunsReportRouter } from './routes/check-runs-report.routes';
import { createPhotosRouter } from './routes/photos.routes';
import { createChecksRouter } from './routes/checks.routes';
import { createGeometryRouter } from './routes/geometry.routes';
import { createHealthProbe, createHealthRouter, type HealthProbe } from './routes/health.routes';
import { createInvitationsRouter } from './routes/invitations.routes';
import { createMembersRouter } from './routes/members.routes';
import { createClubSettingsRouter } from './routes/club-settings.routes';
import { createAuditRouter } from './routes/audit.routes';
import { createJobsRouter } from './routes/jobs.routes';
import { createMailboxRouter } from './routes/mailbox.routes';
import { appVersion, createMetaRouter } from './routes/meta.routes';
import { createOpenApiRouter } from './routes/openapi.routes';
import type { Route, RouteTableRouter } from './routes/route-table';
import { createRulebooksRouter } from './routes/rulebooks.routes';
import { createSubmissionsRouter } from './routes/submissions.routes';
import { createReviewRouter } from './routes/review.routes';
import { createCageRecordsRouter } from './routes/cage-records.routes';
import { createVerifyRouter } from './routes/verify.routes';
import { createRulebookAdminRouter } from './routes/rulebook-admin.routes';
import { createTubeStockRouter } from './routes/tube-stock.routes';
import { createJournalRouter } from './routes/journal.routes';
import { createFabricationRouter } from './routes/fabrication.routes';
import type { RepublishQueue } from './services/rulebook-admin.service';
import { createServices, type Services } from './services';
import { createLimits, limitSettings, type LimitOverrides } from './services/limits';
import type { JobControl } from './services/jobs';

export interface CreateAppOptions {
  /** An initialized DataSource (the session store shares its pool). */
  dataSource: DataSource;
  config: Config;
  logger?: Logger;
  /** Replace the services (tests); built from the DataSource by default. */
  services?: Services;
  /** Smaller limits than services/limits' defaults (tests). */
  limits?: LimitOverrides;
  /** Prune expired sessions and limit counters on a timer (default: on, except when NODE_ENV=test). */
  pruneSessions?: boolean;
  /** Folder of the production front-end build; null turns static serving off. */
  frontendDist?: string | null;
  /** Where a publish sends its re-check job (pg-boss in server.ts); without it publishing queues nothing. */
  republishQueue?: RepublishQueue | null;
  /** Runs a failed job again (POST /api/jobs/:id/retry); pg-boss in server.ts. Without it that route answers 409. */
  jobControl?: JobControl | null;
}

export const jsonBodyLimit = '100kb';

function securityHeaders(config: Config) {
  const overTls = config.publicUrl.startsWith('https://');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        // PrimeVue sets inline styles at run time.
        styleSrc: ["'self'", "'unsafe-inline'"],
        fontSrc: ["'self'", 'data:'],
        imgSrc: ["'self'", 'data:', 'blob:'],
        connectSrc: ["'self'"],
        workerSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        ...(overTls ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: overTls ? { maxAge: 180 * 24 * 3600 } : false,
    // One framing policy: the CSP's frame-ancestors 'none' says it, so no X-Frame-Options beside it.
    xFrameOptions: false,
  });
}

/** Paths that name a file rather than a screen of the app (screens never end in an extension). */
const staticFileName = /\.(?:m?js|css|map|json|webmanifest|png|jpe?g|gif|svg|ico|webp|avif|woff2?|ttf|otf|txt|xml|html?)$/i;

function serveFrontend(app: Express, dist: string): void {
  const indexHtml = join(dist, 'index.html');
  app.use(
    express.static(dist, {
      index: false,
      setHeaders: (res, path) => {
        // Vite fingerprints files under assets/, so they never change under the same name.
        if (path.includes(`${join(dist, 'assets')}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
      },
    }),
  );
  app.get('/{*splat}', (req, res, next) => {
    if (req.path === '/api' || req.path.startsWith('/api/')) return next();
    // A file that is not in the build (a source map, an old chunk) is a 404, not the app page: a stale
    // client asking for a renamed chunk would otherwise get HTML and fail with a confusing MIME error.
    if (req.path.startsWith('/assets/') || staticFileName.test(req.path)) {
      res.status(404).type('text/plain').send('Not found');
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml, (err) => err && next(err));
  });
}

export function createApp(options: CreateAppOptions): Express {
  const { dataSource, config } = options;
  const logger = options.logger ?? createLogger(config.logLevel);
  const services = options.services ?? createServices(dataSource, { publicUrl: config.publicUrl, uploadDir: config.uploadDir, storage: config.photoStorage, recheckWorkers: config.recheckWorkers, recheckBatchSize: config.recheckBatchSize });

  const app = express();
  app.locals.services = services;
  app.set('trust proxy', config.trustProxy);
  app.disable('x-powered-by');
  // First, so that every request (health, static files, a 404) gets an id and its line in the log.
  app.use(createRequestLog(logger));
  app.use(securityHeaders(config));

  const healthProbe = createHealthProbe(dataSource);
  app.locals.healthProbe = healthProbe;
  // Every route table mounted, in order: /api/openapi.json describes exactly these.
  const mounted: Route[] = [];
  const healthRouter = createHealthRouter(healthProbe);
  mounted.push(...healthRouter.routes);
  app.use('/api', healthRouter);

  const prune = options.pruneSessions ?? config.nodeEnv !== 'test';
  const sessionSetup: SessionSetup = createSessionMiddleware({ dataSource, secret: config.sessionSecret, logger, pruneSessions: prune });
  app.locals.sessionStore = sessionSetup.store;
  const passport = createPassport(services);
  const limits = createLimits(dataSource, limitSettings(options.limits), { clearExpired: prune });
  const csrf = createCsrfProtection(config.sessionSecret);

  const api = express.Router();
  // Answers are personal (a session's clubs, sheets, photos): no shared cache may keep them, and no
  // browser cache either unless a route says otherwise (photos and PDFs set their own).
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'private, no-store');
    next();
  });
  api.use(express.json({ limit: jsonBodyLimit }));
  // NUL, lone surrogates, over-deep nesting and `__proto__` keys: 400 at their path, before anything reads them.
  api.use(refuseUnsafeInput);
  api.use(sessionSetup.middleware);
  api.use(passport.session());
  // After the session middleware, which reads its own cookie (csrf-csrf's advice).
  api.use(cookieParser());
  api.use(csrf.middleware);
  const use = (router: RouteTableRouter) => {
    api.use(router);
    mounted.push(...router.routes);
  };
  use(createAuthRouter({ services, passport, limits, csrf }));
  use(createPasswordResetRouter({ services, limits }));
  use(createAccountRouter({ services }));
  use(createInvitationsRouter({ services }));
  use(createMembersRouter({ services }));
  use(createClubSettingsRouter({ services }));
  use(createRulebooksRouter({ services }));
  use(createRulebookAdminRouter({ services, republishQueue: options.republishQueue ?? null }));
  use(createChecksRouter({ services }));
  use(createGeometryRouter());
  use(createCarsRouter({ services }));
  use(createCarTransfersRouter({ services }));
  use(createBuildSheetsRouter({ services }));
  use(createPhotosRouter({ services }));
  use(createCheckRunsReportRouter({ services }));
  use(createMetaRouter({ mailboxEnabled: config.fakeSmtp }));
  use(createAuditRouter({ services }));
  use(createJobsRouter({ services, control: options.jobControl ?? null }));
  use(createSubmissionsRouter({ services }));
  use(createReviewRouter({ services }));
  use(createCageRecordsRouter({ services }));
  use(createTubeStockRouter({ services }));
  use(createJournalRouter({ services }));
  use(createFabricationRouter({ services }));
  use(createVerifyRouter({ services, limits }));
  // The development mailbox exists only while the fake SMTP server does; otherwise its routes are 404.
  if (config.fakeSmtp) use(createMailboxRouter({ services }));
  use(createOpenApiRouter({ routes: () => mounted, version: appVersion }));
  api.use(apiNotFound);
  app.use('/api', api);

  const dist = options.frontendDist === undefined ? resolve(projectRoot, 'frontend/dist') : options.frontendDist;
  if (dist && existsSync(join(dist, 'index.html'))) serveFrontend(app, dist);

  app.use(createErrorHandler(logger));
  return app;
}

/** Stops what createApp started (the session store's prune timer). The DataSource stays open. */
export async function closeApp(app: Express): Promise<void> {
  const store = app.locals.sessionStore as SessionSetup['store'] | undefined;
  await store?.close();
  // The check worker threads belong to the services; end them with the app.
  await (app.locals.services as Services | undefined)?.checks.close();
  await (app.locals.healthProbe as HealthProbe | undefined)?.close();
}
