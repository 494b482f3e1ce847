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
  const pool = new pg.Pool({ connectionString: databaseUrl, max });
  return { pool, db: drizzle(pool, { schema }) };
}
