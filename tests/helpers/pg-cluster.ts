/**
 * A PostgreSQL cluster of a fault test's own: its own data folder and port, made and driven by
 * scripts/pg.sh exactly as npm start makes the real one (PostgreSQL's safe defaults for fsync,
 * full_page_writes and synchronous_commit). Fault tests restart and kill it; the shared test cluster
 * that the other tests use is never touched.
 */
import { execFile, execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);
const ROOT = path.resolve(import.meta.dirname, '../..');

export interface FaultCluster {
  port: number;
  dataRoot: string;
  url(db?: string): string;
  /** `pg_ctl restart -m fast`, as a minor upgrade or a failover does. */
  restart(): Promise<void>;
  stop(): Promise<void>;
  /** `scripts/pg.sh up` with the safe settings, as npm start runs it; returns what it printed. */
  start(): Promise<string>;
  /** SIGKILL to the postmaster and then to every process it started: a crash, not a shutdown. Resolves once they are gone. */
  kill(): Promise<void>;
  destroy(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

export async function createFaultCluster(name: string, databases: string[] = ['brackline_fault'], options: { relaxed?: boolean } = {}): Promise<FaultCluster> {
  const port = await freePort();
  const dataRoot = path.join(process.env.BRACKLINE_DATA ?? path.join(ROOT, '.data'), 'faults', `${name}-${port}`);
  rmSync(dataRoot, { recursive: true, force: true });
  mkdirSync(dataRoot, { recursive: true });
  // The safe settings unless asked: PG_RELAXED is cleared even if the test run itself set it.
  const env = { ...process.env, PGPORT: String(port), BRACKLINE_DATA: dataRoot, PG_RELAXED: 'false' };
  const pg = (...args: string[]) => run('bash', [path.join(ROOT, 'scripts/pg.sh'), ...args], { env, cwd: ROOT });
  await run('bash', [path.join(ROOT, 'scripts/pg.sh'), 'up', ...databases], { env: { ...env, PG_RELAXED: options.relaxed ? 'true' : 'false' }, cwd: ROOT });
  return {
    port,
    dataRoot,
    url: (db = databases[0]) => `postgres://app@127.0.0.1:${port}/${db}`,
    restart: async () => void (await pg('restart')),
    stop: async () => void (await pg('stop')),
    start: async () => (await pg('up')).stdout,
    async kill() {
      const pid = Number(readFileSync(path.join(dataRoot, 'pg', 'postmaster.pid'), 'utf8').split('\n')[0]);
      // Its children first listed, then killed right after it, before any of them can finish cleanly.
      let listed = '';
      try {
        listed = execFileSync('ps', ['-o', 'pid=', '--ppid', String(pid)], { encoding: 'utf8' });
      } catch {
        // ps exits 1 when it lists nothing.
      }
      const children = listed
        .split('\n')
        .map((s) => Number(s.trim()))
        .filter((n) => n > 0);
      process.kill(pid, 'SIGKILL');
      for (const c of children) {
        try {
          process.kill(c, 'SIGKILL');
        } catch {
          // Already gone.
        }
      }
      // Until they are reaped, pg_ctl still sees the postmaster's pid as running.
      const started = Date.now();
      while ([pid, ...children].some((p) => existsSync(`/proc/${p}`)) && Date.now() - started < 15_000) await new Promise((r) => setTimeout(r, 50));
    },
    async destroy() {
      await pg('stop').catch(() => undefined);
      rmSync(dataRoot, { recursive: true, force: true });
    },
  };
}
