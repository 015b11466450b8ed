import type { Request } from 'express';
import type { DataSource } from 'typeorm';

/**
 * What the answer caches of one request are keyed by, read once per request in one query: the
 * current run and the counters of `data_versions` (migration DataVersions: every transaction
 * that writes what a domain's answers read raises the domain's counter at its commit, whichever
 * process wrote). Read before the data it keys, so data kept under a counter is never older
 * than the counter.
 */
export interface DataVersions {
  /** The current run's id, or null before the first run. */
  run: string | null;
  /** People, roles, sites and sessions. */
  access: string;
  /** The flag list. */
  flags: string;
  /** The period calendar. */
  periods: string;
  /** Sites, exposure groups and outcomes. */
  config: string;
  /** The run history. */
  runs: string;
}

const asked = new WeakMap<Request, Promise<DataVersions>>();

/** The versions `req` is answered against, read at its first need and shared by its later ones. */
export function versionsOf(ds: DataSource, req: Request): Promise<DataVersions> {
  let found = asked.get(req);
  if (!found) {
    found = freshVersions(ds);
    asked.set(req, found);
    found.catch(() => asked.delete(req));
  }
  return found;
}

interface Reads {
  /** The read on its way to the server. */
  running: Promise<DataVersions> | null;
  /** The read that starts when `running` ends, shared by everyone who asked meanwhile. */
  queued: Promise<DataVersions> | null;
  /** Callers waiting for `queued`. */
  waiting: number;
}
const readsOf = new WeakMap<DataSource, Reads>();

/** How long callers wait for a running read to end before their own starts anyway (a stalled connection must not hold every request). */
export const VERSIONS_PATIENCE_MS = 500;

/**
 * The versions as of a moment after this call: a read that starts now, or, while one is already
 * running, the next read, which starts when it ends (or after `patienceMs`) and is shared by every
 * caller that asked in between. A read that started before the call is never shared with it (its
 * snapshot could miss a commit the caller has seen). Under 50 readers this makes a few hundred
 * queries a second instead of one per request (hand-written: the usual request coalescers share
 * the running call, which would be stale here).
 */
export function freshVersions(
  ds: DataSource,
  read: (ds: DataSource) => Promise<DataVersions> = readVersions,
  patienceMs = VERSIONS_PATIENCE_MS,
): Promise<DataVersions> {
  let reads = readsOf.get(ds);
  if (!reads) readsOf.set(ds, (reads = { running: null, queued: null, waiting: 0 }));
  const r = reads;
  const start = (): Promise<DataVersions> => {
    const p = read(ds);
    r.running = p;
    const clear = () => {
      if (r.running === p) r.running = null;
    };
    p.then(clear, clear);
    return p;
  };
  if (!r.running) return start();
  if (!r.queued) {
    const running = r.running;
    const queued = new Promise<void>((resolve) => {
      const timer = setTimeout(resolve, patienceMs);
      const done = () => {
        clearTimeout(timer);
        resolve();
      };
      running.then(done, done);
    }).then(() => {
      r.queued = null;
      return start();
    });
    r.queued = queued;
  }
  r.waiting += 1;
  const leave = () => {
    r.waiting -= 1;
  };
  r.queued.then(leave, leave);
  return r.queued;
}

/** Requests waiting for the next shared read (they wait for the database as much as the pool's own waiters do). */
export function versionsWaiting(ds: DataSource): number {
  return readsOf.get(ds)?.waiting ?? 0;
}

export async function readVersions(ds: DataSource): Promise<DataVersions> {
  const [row] = (await ds.query(
    `SELECT (SELECT run_id::text FROM current_run) AS run, (SELECT json_object_agg(domain, version::text) FROM data_versions) AS v`,
  )) as Array<{ run: string | null; v: Record<string, string> | null }>;
  const v = row?.v ?? {};
  return {
    run: row?.run ?? null,
    access: v.access ?? '0',
    flags: v.flags ?? '0',
    periods: v.periods ?? '0',
    config: v.config ?? '0',
    runs: v.runs ?? '0',
  };
}
