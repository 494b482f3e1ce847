/**
 * Applies the generated SQL in drizzle/ (drizzle-kit migrate fails silently in 0.31.10+,
 * stack.md gotcha 8, so the drizzle-orm migrator is used instead).
 */
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { createDb } from './client';

export async function runMigrations(databaseUrl: string): Promise<void> {
  const { db, pool } = createDb(databaseUrl, 1);
  try {
    await migrate(db, { migrationsFolder: new URL('../../drizzle', import.meta.url).pathname });
  } finally {
    await pool.end();
  }
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
