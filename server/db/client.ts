import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema';

export type Database = NodePgDatabase<typeof schema>;

export interface DbHandle {
  pool: pg.Pool;
  db: Database;
}

/** One pool per process; web servers stay stateless so several can share the database. */
export function createDb(databaseUrl: string, max = 10): DbHandle {
  // JIT compilation costs ~0.7 s on every spatial join of the screening and never pays back on
  // queries this short (measured in npm run bench): off for the app's connections.
  const pool = new pg.Pool({ connectionString: databaseUrl, max, options: '-c jit=off' });
  return { pool, db: drizzle(pool, { schema }) };
}
