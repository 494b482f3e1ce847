/**
 * Readiness of this process for traffic (GET /api/ready, for a load balancer or an orchestrator):
 * the database answers and every migration shipped with this build has been applied to it.
 * A process started before `npm run db:migrate` reports not ready instead of failing requests.
 */
import { readFileSync } from 'node:fs';
import type pg from 'pg';

interface Journal {
  entries: { when: number; tag: string }[];
}

const journal: Journal = JSON.parse(readFileSync(new URL('../../drizzle/meta/_journal.json', import.meta.url), 'utf8'));
const latest = journal.entries.reduce((a, e) => (e.when > a.when ? e : a), journal.entries[0]);

export interface Readiness {
  status: 'ready' | 'not-ready';
  database: 'ok' | 'unreachable';
  migrations: 'applied' | 'pending' | 'unknown';
  /** The newest migration this build expects, by its tag. */
  expected: string;
  message?: string;
}

export async function readiness(pool: pg.Pool): Promise<Readiness> {
  let applied: number | null;
  try {
    // drizzle's migrator records each migration's journal time in created_at.
    const res = await pool.query<{ latest: string | null }>('SELECT max(created_at)::text AS latest FROM drizzle.__drizzle_migrations');
    applied = res.rows[0].latest === null ? 0 : Number(res.rows[0].latest);
  } catch (err) {
    const code = (err as { code?: string }).code;
    // 42P01 / 3F000: the migrations table or schema does not exist yet (a new database).
    if (code === '42P01' || code === '3F000') applied = 0;
    else
      return {
        status: 'not-ready',
        database: 'unreachable',
        migrations: 'unknown',
        expected: latest.tag,
        message: 'The database does not answer.',
      };
  }
  if (applied < latest.when) {
    return {
      status: 'not-ready',
      database: 'ok',
      migrations: 'pending',
      expected: latest.tag,
      message: 'Migrations are pending: run `npm run db:migrate` with this DATABASE_URL.',
    };
  }
  return { status: 'ready', database: 'ok', migrations: 'applied', expected: latest.tag };
}
