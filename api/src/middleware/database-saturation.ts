import type { RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import { poolOf } from '@ratewarden/db';
import { AppError } from '../lib/app-error';
import { versionsWaiting } from '../lib/data-versions';

/** Seconds a client is asked to wait when the database is saturated. */
export const RETRY_AFTER_SECONDS = 2;

/**
 * Overload answered as such: when `queueMax` requests already wait for a database connection
 * (directly, or for the data-versions read they share while the pool has waiters), a
 * new one is answered 503 with Retry-After at once instead of joining a queue it would time out
 * in (the error handler answers the same to a request whose wait for a connection timed out).
 */
export function databaseSaturation(ds: DataSource, queueMax: number): RequestHandler {
  return (_req, res, next) => {
    const pool = poolOf(ds);
    // While the pool has waiters, requests waiting for the shared data-versions read wait for it too.
    const waiting = pool && pool.waitingCount > 0 ? pool.waitingCount + versionsWaiting(ds) : 0;
    if (pool && waiting >= queueMax) {
      res.set('retry-after', String(RETRY_AFTER_SECONDS));
      next(new AppError('service_unavailable', 'the database is busy; try again in a moment'));
      return;
    }
    next();
  };
}

/** The pg pool's error when no connection came free within DB_POOL_WAIT_MS. */
export function isPoolWaitTimeout(err: unknown): boolean {
  return err instanceof Error && /timeout exceeded when trying to connect/i.test(err.message);
}
