import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { RequestHandler } from 'express';
import type pg from 'pg';
import type { DataSource } from 'typeorm';
import type { ApiConfig } from '../config';

declare module 'express-session' {
  interface SessionData {
    userId?: string;
    csrfToken?: string;
    idToken?: string;
    returnTo?: string;
  }
}

/**
 * Seconds a session's stored expiry may lag its cookie's: a rolling session is written back at
 * most this often by one process, not on every request (a write per read was a third of a cached
 * read's cost). An 8-hour session may so end up to a minute early, never late.
 */
export const TOUCH_EVERY_SECONDS = 60;

/** Sessions kept in PostgreSQL (table user_sessions), so any API process can serve any request. */
export function sessionMiddleware(ds: DataSource, config: ApiConfig): RequestHandler {
  const PgStore = throttledTouch(connectPgSimple(session));
  // TypeORM's postgres driver keeps its pg.Pool as `master`; the store shares it.
  const pool = (ds.driver as unknown as { master: pg.Pool }).master;
  return session({
    name: 'rw.sid',
    store: new PgStore({ pool, tableName: 'user_sessions', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }),
    secret: config.SESSION_SECRET,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.NODE_ENV === 'production',
      maxAge: config.SESSION_HOURS * 3600 * 1000,
    },
  });
}

type StoreClass = ReturnType<typeof connectPgSimple>;

/** The store, with `touch` skipped while this process wrote the session's expiry less than TOUCH_EVERY_SECONDS ago. */
function throttledTouch(Store: StoreClass): StoreClass {
  const touched = new Map<string, number>();
  return class extends Store {
    override touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
      const now = Date.now();
      if (now - (touched.get(sid) ?? 0) < TOUCH_EVERY_SECONDS * 1000) {
        fn?.();
        return;
      }
      if (touched.size > 10_000) touched.clear();
      touched.set(sid, now);
      super.touch(sid, sess, (err?: unknown) => {
        if (err) touched.delete(sid);
        fn?.(err);
      });
    }

    override destroy(sid: string, fn?: (err?: unknown) => void): void {
      touched.delete(sid);
      super.destroy(sid, fn);
    }
  };
}
