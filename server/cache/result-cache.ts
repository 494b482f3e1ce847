/**
 * Answers of the heavy list routes (the leases list, the screenings page, the yearly figures) kept per caller
 * until something they read changes, in every process at once.
 *
 * Why not a time-to-live or LISTEN/NOTIFY: a grower who edits a lease or a regulator whose re-screen has just
 * finished must see it on the next page, whichever process wrote it. Each transaction that changes a table these
 * lists read leaves its id in `result_changes` (statement triggers, migration 0020). An answer is kept with the
 * PostgreSQL snapshot taken before it was read; it is served again only while no transaction in `result_changes`
 * has become visible since that snapshot (`pg_visible_in_snapshot`). A hit therefore costs one index probe
 * instead of the list's joins and sorts, and a write anywhere is seen by the very next request anywhere.
 * The snapshot is taken before the list is read, so a change committed in between only costs a needless miss.
 */
import { LRUCache } from 'lru-cache';
import type pg from 'pg';
import { type CurrentUser, JsonText } from '../http/route';

export interface ResultCacheOptions {
  /** Off: every request reads the database (RESULT_CACHE=false). */
  enabled: boolean;
  /** Bound on the JSON size of the kept answers, in bytes. */
  maxBytes: number;
  /** An answer unread this long is dropped even if nothing changed (memory, not correctness). */
  ttlMs: number;
}

export interface ResultCacheStats {
  hits: number;
  misses: number;
  entries: number;
  bytes: number;
}

export interface ResultCache {
  /**
   * The answer of `route` for this caller and query, serialised: the kept one when nothing it reads has changed
   * since, else `read()`'s (one read for callers asking the same thing at the same time).
   */
  answer(route: string, user: CurrentUser, query: unknown, read: () => Promise<unknown>): Promise<JsonText>;
  stats(): ResultCacheStats;
}

interface Kept {
  snapshot: string;
  value: JsonText;
}

/** How long `result_changes` rows are kept: far longer than any transaction and any kept answer. */
const CHANGE_LOG_DAYS = 1;
const PRUNE_EVERY_MS = 10 * 60_000;

export function createResultCache(pool: pg.Pool, options: ResultCacheOptions): ResultCache {
  const kept = new LRUCache<string, Kept>({
    maxSize: Math.max(1, options.maxBytes),
    ttl: options.ttlMs,
    updateAgeOnGet: true,
  });
  /** Reads in progress, by key, with the snapshot each started from. */
  const reading = new Map<string, { snapshot: Promise<string>; value: Promise<JsonText> }>();
  let hits = 0;
  let misses = 0;
  let lastPrune = 0;

  async function currentSnapshot(): Promise<string> {
    const res = await pool.query<{ s: string }>('SELECT pg_current_snapshot()::text AS s');
    return res.rows[0].s;
  }

  /** True when a transaction that changed a listed table has committed since `snapshot` was taken. */
  async function changedSince(snapshot: string): Promise<boolean> {
    const res = await pool.query<{ changed: boolean }>(
      `SELECT EXISTS (SELECT 1 FROM result_changes
                       WHERE txid >= pg_snapshot_xmin($1::pg_snapshot) AND NOT pg_visible_in_snapshot(txid, $1::pg_snapshot)) AS changed`,
      [snapshot],
    );
    return res.rows[0].changed;
  }

  function pruneNowAndThen() {
    const now = Date.now();
    if (now - lastPrune < PRUNE_EVERY_MS) return;
    lastPrune = now;
    pool.query(`DELETE FROM result_changes WHERE changed_at < now() - interval '${CHANGE_LOG_DAYS} day'`).catch(() => {
      // The next prune tries again; an unpruned row only makes a later check scan one more index entry.
    });
  }

  function read(key: string, load: () => Promise<unknown>): Promise<JsonText> {
    const snapshot = currentSnapshot();
    const value = (async () => {
      const s = await snapshot;
      const v = new JsonText(JSON.stringify(await load()));
      // One answer never takes more than a tenth of the room (a regulator's whole jurisdiction, say).
      if (v.text.length <= options.maxBytes / 10) kept.set(key, { snapshot: s, value: v }, { size: Math.max(1, v.text.length) });
      return v;
    })();
    const entry = { snapshot, value };
    reading.set(key, entry);
    const done = () => {
      if (reading.get(key) === entry) reading.delete(key);
    };
    value.then(done, done);
    return value;
  }

  return {
    async answer(route: string, user: CurrentUser, query: unknown, load: () => Promise<unknown>): Promise<JsonText> {
      if (!options.enabled) return new JsonText(JSON.stringify(await load()));
      // The caller's id, role and jurisdiction decide what they may see; the validated query what they asked.
      const key = `${route}\u0000${user.id}\u0000${user.role}\u0000${user.jurisdictionId ?? ''}\u0000${JSON.stringify(query)}`;
      const found = kept.get(key);
      if (found && !(await changedSince(found.snapshot))) {
        hits += 1;
        return found.value;
      }
      misses += 1;
      pruneNowAndThen();
      // Join a read already under way only if nothing changed since it began: a caller who has just written
      // must not be handed an answer read before the write.
      const running = reading.get(key);
      if (running) {
        const snapshot = await running.snapshot.catch(() => null);
        if (snapshot && !(await changedSince(snapshot))) return running.value;
      }
      return read(key, load);
    },
    stats() {
      return { hits, misses, entries: kept.size, bytes: kept.calculatedSize };
    },
  };
}

/** A cache that keeps nothing: route contexts built without a database (the API contract tests). */
export const NO_RESULT_CACHE: ResultCache = {
  answer: async (_route, _user, _query, load) => new JsonText(JSON.stringify(await load())),
  stats: () => ({ hits: 0, misses: 0, entries: 0, bytes: 0 }),
};
