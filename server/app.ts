/**
 * Builds the Express app; index.ts alone listens. Tests call createApp() with a test database.
 */
import { ExpressAuth } from '@auth/express';
import express, { type Express } from 'express';
import compression from 'compression';
import helmet from 'helmet';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { createAuthConfig } from './auth/auth-config';
import { createUserResolver } from './auth/current-user';
import { createResultCache } from './cache/result-cache';
import type { DbHandle } from './db/client';
import { readiness } from './db/readiness';
import type { Env } from './env';
import { buildOpenApiDocument, createRegistry } from './http/openapi';
import { declaredRoutes, documentRoute, type RouteContext } from './http/route';
import { NotFoundError } from './lib/errors';
import type { Mailer } from './mail/mailer';
import { errorHandler } from './middleware/error-handler';
import { createRateLimits, DEFAULT_RATE_LIMITS } from './middleware/rate-limits';
import { registerAccountRoutes } from './routes/account.routes';
import { registerAdminRoutes } from './routes/admin.routes';
import { registerCalcRoutes } from './routes/calc.routes';
import { registerCoastRoutes } from './routes/coasts.routes';
import { registerRegionRoutes } from './routes/regions.routes';
import { createRegionsService } from './services/regions.service';
import { registerImportRoutes } from './routes/imports.routes';
import { registerLeaseRoutes } from './routes/leases.routes';
import { registerMonitoringRoutes } from './routes/monitoring.routes';
import { registerRiverRoutes } from './routes/rivers.routes';
import { registerScreeningRoutes } from './routes/screening.routes';
import { registerSharingRoutes } from './routes/sharing.routes';
import { registerInboxRoutes } from './routes/inbox.routes';
import { registerOverviewRoutes } from './routes/overview.routes';
import { createInboxService } from './services/inbox.service';
import { registerClientRoutes } from './routes/clients.routes';
import { createClientsService } from './services/clients.service';
import { registerZoneRoutes } from './routes/zones.routes';
import { createZonesService } from './services/zones.service';
import { createInlineScreeningJobs, type ScreeningJobs } from './jobs/screening-jobs';
import { createRiversService } from './services/rivers.service';
import { createScreeningService } from './services/screening.service';
import { createSweepService } from './services/sweep.service';
import { createAccountsService } from './services/accounts.service';
import { createImportsService } from './services/imports.service';
import { createLeasesService } from './services/leases.service';
import { createMonitoringService } from './services/monitoring.service';
import { createSharingService } from './services/sharing.service';
import { DEFAULT_UPLOAD_LIMITS, type UploadLimits } from '#shared/geometry/upload-limits';
import { type AlertJobs, createInlineAlertJobs } from './jobs/alert-jobs';
import { registerAlertRoutes } from './routes/alerts.routes';
import { mountBillingWebhook, registerBillingRoutes } from './routes/billing.routes';
import { registerGaugeRoutes } from './routes/gauges.routes';
import { createAlertsService } from './services/alerts.service';
import { createBillingService } from './services/billing.service';
import { createGaugesService } from './services/gauges.service';

export interface AppDeps {
  env: Env;
  db: DbHandle;
  mailer: Mailer;
  /** Requests per window for sign-in, sign-up, reset and invitation accept, per client address. */
  authRateLimit?: { limit: number; windowMs: number };
  /** The same requests per window for one account (e-mail address or token). */
  accountRateLimit?: { limit: number; windowMs: number };
  calcRateLimit?: { limit: number; windowMs: number };
  /** Names the shared rate-limit counters in PostgreSQL; tests give each app its own. */
  rateLimitPrefix?: string;
  uploadLimits?: Partial<UploadLimits>;
  /** Background screening; inline (at once, in the request) when not given. */
  jobs?: ScreeningJobs;
  /** Alert evaluation, alert e-mails and the gauge feed poll (pg-boss); inline (after each commit) when not given. */
  alertJobs?: AlertJobs;
  /** Check JSON answers against the declared response schemas (default: when NODE_ENV is test). */
  checkResponses?: boolean;
}

const API_BASE = '/api/v1';

export function createApp(deps: AppDeps): Express {
  const { env, mailer } = deps;
  const db = deps.db.db;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          // The optional basemap's tile server is the one outside origin a page may load images from.
          imgSrc: ["'self'", 'data:', 'blob:', ...(env.BASEMAP_URL ? [new URL(env.BASEMAP_URL.replace(/\{[a-z]\}/g, '0')).origin] : [])],
          styleSrc: ["'self'", "'unsafe-inline'"],
          workerSrc: ["'self'", 'blob:'],
          connectSrc: ["'self'"],
          fontSrc: ["'self'", 'data:'],
          objectSrc: ["'none'"],
          upgradeInsecureRequests: null,
        },
      },
    }),
  );

  // JSON, the client's scripts and the tiles gzipped for clients that ask (every browser does). A kept answer of the result
  // cache arrives gzipped already (defineRoute), and compression leaves an encoded body alone.
  app.use(compression({ threshold: 1024 }));

  // Throttles on the sign-in family and the calculators only; counters shared by every app process.
  const limits = createRateLimits({
    pool: deps.db.pool,
    prefix: deps.rateLimitPrefix ?? 'brackline',
    address: deps.authRateLimit ?? DEFAULT_RATE_LIMITS.address,
    account: deps.accountRateLimit ?? DEFAULT_RATE_LIMITS.account,
    calc: deps.calcRateLimit ?? DEFAULT_RATE_LIMITS.calc,
  });

  const authConfig = createAuthConfig({
    db,
    mailer,
    secret: env.AUTH_SECRET,
    appUrl: env.APP_URL,
    sessionMaxAgeSeconds: env.SESSION_MAX_AGE_SECONDS,
    maxFailures: env.SIGN_IN_MAX_FAILURES,
    windowMinutes: env.SIGN_IN_WINDOW_MINUTES,
    mailFrom: env.MAIL_FROM,
  });
  // Auth.js must be mounted at '/auth' exactly on Express 5 (stack.md gotcha 7).
  // Password sign-in and sign-in link requests (per address and per e-mail), and following a link (per address).
  // Reading the session (/auth/session, /auth/csrf) is never throttled.
  app.post(
    ['/auth/callback/credentials', '/auth/signin/nodemailer'],
    express.urlencoded({ extended: false }),
    express.json(),
    ...limits.signIn,
  );
  app.get('/auth/callback/nodemailer', limits.signIn[0]);
  app.use('/auth', express.urlencoded({ extended: false }), express.json(), ExpressAuth(authConfig));

  const registry = createRegistry();
  const healthSchema = z.object({
    status: z.enum(['ok', 'degraded']),
    database: z.enum(['ok', 'unreachable']),
    smtp: z.enum(['ok', 'unreachable']),
    time: z.string().describe('ISO 8601'),
  });
  // Liveness: the process runs and answers (a process manager restarts it otherwise). It stays 200 during a
  // database outage, because restarting the app would not bring PostgreSQL back.
  app.get('/api/health/live', (_req, res) => {
    res.json({ status: 'ok', time: new Date().toISOString() });
  });
  // Readiness and health for people and load balancers: 200 "ok", or 503 "degraded" with Retry-After when
  // PostgreSQL or the mail server does not answer within two seconds. Never throttled, never needs a session.
  app.get('/api/health', async (_req, res) => {
    const within = <T>(p: Promise<T>, fallback: T) =>
      Promise.race([p.catch(() => fallback), new Promise<T>((resolve) => setTimeout(() => resolve(fallback), 2_000).unref())]);
    const [database, smtp] = await Promise.all([
      within(
        deps.db.pool.query('select 1').then(() => 'ok' as const),
        'unreachable' as const,
      ),
      within(
        mailer.verify().then((ok) => (ok ? ('ok' as const) : ('unreachable' as const))),
        'unreachable' as const,
      ),
    ]);
    const status = database === 'ok' && smtp === 'ok' ? 'ok' : 'degraded';
    if (status !== 'ok') res.set('Retry-After', '5');
    res.status(status === 'ok' ? 200 : 503).json({ status, database, smtp, time: new Date().toISOString() });
  });

  documentRoute(
    { registry, basePath: '/api' },
    {
      method: 'get',
      path: '/health',
      operationId: 'getHealth',
      summary: 'Whether the database and the mail server answer (200 ok, 503 degraded)',
      tags: ['health'],
      access: { public: true },
      response: healthSchema,
      otherResponses: { 503: { description: 'Degraded: the database or the mail server does not answer', schema: healthSchema } },
    },
  );

  documentRoute(
    { registry, basePath: '/api' },
    {
      method: 'get',
      path: '/health/live',
      operationId: 'getLiveness',
      summary: 'Whether the process runs (stays 200 during a database outage: restarting the app would not help)',
      tags: ['health'],
      access: { public: true },
      response: z.object({ status: z.literal('ok'), time: z.string().describe('ISO 8601') }),
    },
  );

  const readinessSchema = z.object({
    status: z.enum(['ready', 'not-ready']),
    database: z.enum(['ok', 'unreachable']),
    migrations: z.enum(['applied', 'pending', 'unknown']),
    expected: z.string(),
    message: z.string().optional(),
  });
  documentRoute(
    { registry, basePath: '/api' },
    {
      method: 'get',
      path: '/ready',
      operationId: 'getReadiness',
      summary:
        "Whether this process can take traffic: the database answers and this build's migrations are applied (200 ready, 503 not ready)",
      tags: ['health'],
      access: { public: true },
      response: readinessSchema,
      otherResponses: {
        503: { description: 'Not ready: the database does not answer or migrations are pending', schema: readinessSchema },
      },
    },
  );
  // Readiness (load balancers): the database answers and this build's migrations are applied.
  app.get('/api/ready', async (_req, res) => {
    const ready = await readiness(deps.db.pool);
    res.status(ready.status === 'ready' ? 200 : 503).json(ready);
  });

  const router = express.Router();
  router.use(express.json({ limit: '2mb' }));
  router.post(
    ['/account/sign-up', '/account/password-reset', '/account/password-reset/confirm', '/invitations/:token/accept'],
    ...limits.signIn,
  );
  router.use('/calc', limits.calc);
  const ctx: RouteContext = {
    router,
    registry,
    basePath: API_BASE,
    resolveUser: createUserResolver(db, env.AUTH_SECRET),
    checkResponses: deps.checkResponses ?? env.NODE_ENV === 'test',
    resultCache: createResultCache(deps.db.pool, { enabled: env.RESULT_CACHE, maxBytes: env.RESULT_CACHE_MB * 1e6, ttlMs: 10 * 60_000 }),
  };
  // Tests and benches read the cache's hit counts here.
  app.locals.resultCache = ctx.resultCache;
  const accounts = createAccountsService({ db, mailer, appUrl: env.APP_URL });
  registerAccountRoutes(ctx, accounts);
  registerAdminRoutes(ctx, db, accounts);
  registerCalcRoutes(ctx);
  const uploadLimits = {
    ...DEFAULT_UPLOAD_LIMITS,
    ...Object.fromEntries(Object.entries(deps.uploadLimits ?? {}).filter(([, v]) => v !== undefined)),
  };
  const screening = createScreeningService({ db });
  const jobs = deps.jobs ?? createInlineScreeningJobs(db, screening);
  const leasesChanged = (ids: string[]) => jobs.enqueueLeases(ids);
  registerImportRoutes(
    ctx,
    db,
    createImportsService({ db, limits: uploadLimits, onLeasesChanged: leasesChanged }),
    uploadLimits.maxCompressedBytes,
  );
  registerSharingRoutes(ctx, createSharingService(db));
  registerLeaseRoutes(ctx, createLeasesService(db, { onLeasesChanged: leasesChanged }));
  const rivers = createRiversService({ db, onRiverChanged: async (riverId) => void (await jobs.enqueueRiver(riverId)) });
  registerRiverRoutes(ctx, rivers, jobs);
  registerCoastRoutes(ctx, db);
  registerRegionRoutes(ctx, createRegionsService(db));
  registerInboxRoutes(ctx, createInboxService(db));
  registerOverviewRoutes(ctx, db, { basemapUrl: env.BASEMAP_URL ?? null, basemapAttribution: env.BASEMAP_ATTRIBUTION });
  registerClientRoutes(ctx, createClientsService({ db, mailer, appUrl: env.APP_URL }));
  registerScreeningRoutes(ctx, db, rivers, screening, createSweepService({ db, screening }));
  registerMonitoringRoutes(
    ctx,
    createMonitoringService({ db, onRiverChanged: async (riverId) => void (await jobs.enqueueRiver(riverId)) }),
  );
  // Paid alerts plan: billing (its webhook reads the raw body, so it is mounted before the API router), gauges, alerts.
  const billing = createBillingService({
    db,
    config: {
      apiUrl: env.PAYMENT_API_URL,
      secretKey: env.PAYMENT_SECRET_KEY,
      webhookSecret: env.PAYMENT_WEBHOOK_SECRET,
      priceLookupKey: env.PAYMENT_PRICE_LOOKUP_KEY,
      appUrl: env.APP_URL,
    },
  });
  mountBillingWebhook(app, ctx, billing);
  registerBillingRoutes(ctx, billing);
  const alertJobs = deps.alertJobs ?? createInlineAlertJobs(deps.db.pool);
  const gauges = createGaugesService({ db, jobs: alertJobs, feedUrl: env.GAUGE_FEED_URL });
  registerGaugeRoutes(ctx, gauges);
  const alerts = createAlertsService({
    db,
    pool: deps.db.pool,
    jobs: alertJobs,
    billing,
    sweeps: createSweepService({ db, screening }),
    mailer,
    appUrl: env.APP_URL,
  });
  registerAlertRoutes(ctx, alerts);
  /** Resolves once the alert workers are registered (index.ts and tests await it). */
  app.locals.alertsReady = alertJobs.attach({
    evaluate: (ids) => alertJobs.transaction(async (client, enqueue) => void (await alerts.evaluateReadings(client, enqueue, ids))),
    email: (id, final) => alerts.sendEmail(id, final),
    pollFeed: async () => void (await gauges.pollFeed()),
  });
  registerZoneRoutes(ctx, createZonesService({ db, mailer, screening, rivers, appUrl: env.APP_URL }));

  const openApi = buildOpenApiDocument(registry);
  /** Every documented operation, walked by tests/server/routes/api-contract.test.ts. */
  app.locals.apiRoutes = declaredRoutes(registry);
  router.get('/openapi.json', (_req, res) => {
    res.json(openApi);
  });
  router.use((req, _res, next) =>
    next(new NotFoundError(`No API route ${req.method} ${API_BASE}${req.path}. See ${API_BASE}/openapi.json for the routes.`)),
  );
  app.use(API_BASE, router);
  app.use('/api', (req, _res, next) =>
    next(new NotFoundError(`No API route ${req.method} /api${req.path}. The API lives under ${API_BASE}.`)),
  );

  const dist = path.resolve(import.meta.dirname, '../dist');
  if (env.SERVE_CLIENT && existsSync(path.join(dist, 'index.html'))) {
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(dist, 'index.html')));
  }
  app.use(errorHandler);
  return app;
}
