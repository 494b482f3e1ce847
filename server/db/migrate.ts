/**
 * Applies the generated SQL in drizzle/ (drizzle-kit migrate fails silently in 0.31.10+,
 * stack.md gotcha 8, so the drizzle-orm migrator is used instead).
 */
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { createRequire } from 'node:module';
import path from 'node:path';
import pg from 'pg';
import { migrate as migrateRateLimitStore } from 'postgres-migrations';
import { createDb } from './client';

/**
 * The rate-limit store (@acpr/rate-limit-postgresql) keeps its own schema `rate_limit`, created by
 * the SQL files it ships and tracked in its own table (public.migrations, the store's default). It
 * would apply them itself when the app starts; applying them here too means a fresh database is
 * complete after `npm run db:migrate`, before any app process runs.
 */
async function migrateRateLimits(databaseUrl: string): Promise<void> {
  const entry = createRequire(import.meta.url).resolve('@acpr/rate-limit-postgresql');
  const client = new pg.Client({ connectionString: databaseUrl });
  client.on('error', () => undefined);
  await client.connect();
  try {
    await migrateRateLimitStore({ client }, path.join(path.dirname(entry), 'migrations'));
  } finally {
    await client.end();
  }
}

export async function runMigrations(databaseUrl: string): Promise<void> {
  const { db, pool } = createDb(databaseUrl, 1);
  try {
    await migrate(db, { migrationsFolder: new URL('../../drizzle', import.meta.url).pathname });
  } finally {
    await pool.end();
  }
  await migrateRateLimits(databaseUrl);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error('DATABASE_URL is not set');
    process.exit(1);
  }
  runMigrations(url)
    .then(() => console.log('[brackline] migrations applied'))
    .catch((err) => {
      console.error('[brackline] migration failed:', err);
      process.exit(1);
    });
}
