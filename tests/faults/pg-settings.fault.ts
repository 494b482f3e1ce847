/**
 * npm start and npm test share one .data/pg cluster. npm test may start it without fsync,
 * full_page_writes and synchronous_commit (PG_RELAXED=true); the next `scripts/pg.sh up` without
 * that (npm start, npm run dev) must restart it with PostgreSQL's defaults, which are all "on"
 * (PostgreSQL docs §20.5.1 "Settings": fsync, synchronous_commit and full_page_writes default to on).
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFaultCluster, type FaultCluster } from '../helpers/pg-cluster';

let cluster: FaultCluster;

async function settings(): Promise<Record<string, string>> {
  const client = new pg.Client({ connectionString: cluster.url('postgres') });
  await client.connect();
  try {
    const r = await client.query(`SELECT name, setting FROM pg_settings WHERE name IN ('fsync', 'full_page_writes', 'synchronous_commit')`);
    return Object.fromEntries(r.rows.map((row) => [row.name, row.setting]));
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  cluster = await createFaultCluster('settings', [], { relaxed: true });
}, 120_000);

afterAll(async () => {
  await cluster?.destroy();
});

describe('the cluster npm start runs', () => {
  it('is restarted with the safe settings when npm test left it relaxed', async () => {
    expect(await settings()).toEqual({ fsync: 'off', full_page_writes: 'off', synchronous_commit: 'off' });
    const said = await cluster.start();
    expect(said).toMatch(/restarting it with the safe settings/);
    expect(await settings()).toEqual({ fsync: 'on', full_page_writes: 'on', synchronous_commit: 'on' });
    // A second `up` leaves the safe cluster running as it is.
    expect(await cluster.start()).toMatch(/already running/);
  });
});
