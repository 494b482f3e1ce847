/**
 * Configuration from the environment, validated at boot: a wrong or missing value stops
 * the server with a message naming the variable.
 */
import { z } from 'zod';

const port = (name: string, fallback: number) =>
  z.coerce
    .number({ error: `${name} must be a port number` })
    .int({ error: `${name} must be a whole number` })
    .min(0, { error: `${name} must be between 0 and 65535` })
    .max(65535, { error: `${name} must be between 0 and 65535` })
    .default(fallback);

export const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: port('PORT', 3000),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z
    .string({ error: 'DATABASE_URL is required, e.g. postgres://app@127.0.0.1:54329/brackline' })
    .regex(/^postgres(ql)?:\/\//, { error: 'DATABASE_URL must start with postgres://' }),
  SMTP_URL: z
    .string()
    .regex(/^smtps?:\/\//, { error: 'SMTP_URL must start with smtp:// or smtps://' })
    .default('smtp://127.0.0.1:2525'),
  SMTP_FAKE_PORT: port('SMTP_FAKE_PORT', 2525),
  MAIL_FROM: z.string().default('Brackline <no-reply@brackline.test>'),
  AUTH_SECRET: z
    .string({ error: 'AUTH_SECRET is required (at least 32 characters)' })
    .min(32, { error: 'AUTH_SECRET must be at least 32 characters long' }),
  /** Public base URL used in e-mailed links. */
  APP_URL: z.string().url({ error: 'APP_URL must be a URL such as http://127.0.0.1:3000' }).default('http://127.0.0.1:3000'),
  SESSION_MAX_AGE_SECONDS: z.coerce
    .number()
    .int()
    .positive()
    .default(8 * 3600),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  /** Sign-in attempts per e-mail address within the throttle window before refusing. */
  SIGN_IN_MAX_FAILURES: z.coerce.number().int().positive().default(5),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().int().positive().default(15),
  // --- Paid alerts plan: the payment service (a local fake by default) and the gauge feed.
  /** Base URL of the payment API. The local fake by default; https://api.stripe.com for the hosted service. */
  PAYMENT_API_URL: z
    .string()
    .url({ error: 'PAYMENT_API_URL must be a URL such as http://127.0.0.1:3010' })
    .default('http://127.0.0.1:3010'),
  /** Port of the local payment fake started by npm start (with START_FAKES). */
  PAYMENT_FAKE_PORT: port('PAYMENT_FAKE_PORT', 3010),
  PAYMENT_SECRET_KEY: z
    .string()
    .min(8, { error: 'PAYMENT_SECRET_KEY must be the payment service secret key' })
    .default('sk_test_brackline_local_fake'),
  PAYMENT_WEBHOOK_SECRET: z
    .string()
    .min(8, { error: 'PAYMENT_WEBHOOK_SECRET must be the webhook signing secret' })
    .default('whsec_brackline_local_fake'),
  /** The price of the Alerts plan is looked up (and on the fake, created) by this key. */
  PAYMENT_PRICE_LOOKUP_KEY: z.string().default('brackline-alerts-monthly'),
  /** The local gauge feed (replays the demo rivers' flows); polled every GAUGE_FEED_POLL_SECONDS. */
  GAUGE_FEED_URL: z.string().url({ error: 'GAUGE_FEED_URL must be a URL such as http://127.0.0.1:3011' }).default('http://127.0.0.1:3011'),
  GAUGE_FEED_PORT: port('GAUGE_FEED_PORT', 3011),
  GAUGE_FEED_POLL_SECONDS: z.coerce.number().int().positive().default(60),
  /** Alert e-mail retries while the mail server is down: first delay, doubling, up to the limit. */
  ALERT_RETRY_DELAY_SECONDS: z.coerce.number().int().positive().default(5),
  ALERT_RETRY_LIMIT: z.coerce.number().int().positive().default(16),
  /**
   * An optional raster basemap under the maps, as an XYZ template such as
   * https://tiles.example.org/{z}/{x}/{y}.png. Unset (the default, and in tests) the maps draw
   * vector layers only and work with no internet; set, users can switch the basemap on.
   */
  BASEMAP_URL: z
    .string()
    .regex(/^https?:\/\/[^/]+\/.*\{z\}.*\{x\}.*\{y\}/, {
      error: 'BASEMAP_URL must be an http(s) tile template containing {z}, {x} and {y}, e.g. https://tiles.example.org/{z}/{x}/{y}.png',
    })
    .optional(),
  /** Credit line the basemap's provider asks for, shown on the map. */
  BASEMAP_ATTRIBUTION: z.string().max(300).default(''),
  // --- Several processes, one PostgreSQL (README "Running for a whole authority").
  /** Run the pg-boss workers in this app process (npm start); app processes behind a load balancer set false and leave the work to `npm run worker`. */
  WORKERS: z
    .enum(['true', 'false'], { error: 'WORKERS must be true or false' })
    .default('true')
    .transform((v) => v === 'true'),
  /** Names this process in screening_run_chunks.worker and the logs; host:pid when unset. */
  WORKER_ID: z.string().min(1).max(200).optional(),
  /** Leases per screening chunk job: a river's re-screen is split into chunks that any worker takes. */
  SCREENING_CHUNK_LEASES: z.coerce.number().int().min(1, { error: 'SCREENING_CHUNK_LEASES must be at least 1' }).default(1000),
  /** A chunk not finished this long after a worker took it (the worker died) is given to another worker. */
  SCREENING_CHUNK_EXPIRE_SECONDS: z.coerce.number().int().min(1).max(3600).default(300),
  /** How often pg-boss looks for expired jobs (those of a dead worker) and archives old ones. */
  JOB_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).max(3600).default(30),
  /**
   * Keep the answers of the heavy list routes (leases, screenings, yearly figures) per caller until something they
   * read changes (server/cache/result-cache.ts). false reads the database on every request.
   */
  RESULT_CACHE: z
    .enum(['true', 'false'], { error: 'RESULT_CACHE must be true or false' })
    .default('true')
    .transform((v) => v === 'true'),
  /** Room for the kept answers, in megabytes of JSON. */
  RESULT_CACHE_MB: z.coerce.number().int().min(1, { error: 'RESULT_CACHE_MB must be at least 1' }).max(4096).default(64),
  /** Serve the built client from dist/ (npm start); off in API tests. */
  SERVE_CLIENT: z
    .enum(['true', 'false'])
    .default('true')
    .transform((v) => v === 'true'),
});

export type Env = z.infer<typeof envSchema>;

/** Parses `source` (process.env by default) or throws one error naming every bad variable. */
export function loadEnv(source: Record<string, string | undefined> = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || '(env)'}: ${i.message}`);
    throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  }
  return parsed.data;
}

/** Upload limits from the environment (names match shared/geometry/upload-limits.ts). */
export function uploadLimitsFromEnv(source: Record<string, string | undefined> = process.env) {
  const read = (name: string) => {
    const raw = source[name];
    if (raw === undefined || raw === '') return undefined;
    const n = Number(raw);
    if (!Number.isFinite(n) || n <= 0) throw new Error(`Configuration is not valid:\n  ${name}: must be a positive number`);
    return n;
  };
  return {
    maxCompressedBytes: read('UPLOAD_MAX_BYTES'),
    maxUncompressedBytes: read('UPLOAD_MAX_UNCOMPRESSED_BYTES'),
    maxFeatures: read('UPLOAD_MAX_FEATURES'),
    maxVertices: read('UPLOAD_MAX_VERTICES'),
  };
}

/** loadEnv for an entry point (app or worker): a bad setting ends the process with its message, exit code 2. */
export function loadEnvOrExit(): Env {
  try {
    return loadEnv();
  } catch (err) {
    console.error(`[brackline] ${(err as Error).message}`);
    process.exit(2);
  }
}
