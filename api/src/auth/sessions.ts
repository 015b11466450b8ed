import { AsyncLocalStorage } from 'node:async_hooks';
import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { Request, RequestHandler } from 'express';
import type pg from 'pg';
import type { DataSource } from 'typeorm';
import type { ApiConfig } from '../config';
import { versionsOf } from '../lib/data-versions';

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

/** Sessions a process keeps before it forgets them all (each is a few hundred bytes). */
const KEPT_SESSIONS_MAX = 10_000;

/** The request whose session the store is reading (express-session does not hand it to the store). */
const asking = new AsyncLocalStorage<Request>();

/**
 * Sessions kept in PostgreSQL (table user_sessions), so any API process can serve any request.
 * A process keeps the sessions it read, each under the `access` counter of data_versions it was
 * read at (lib/data-versions.ts), and serves them from memory while the counter stands: deleting
 * a session anywhere (sign-out, sign-in's fresh id, expiry pruning) or changing its content raises
 * the counter at commit, so a signed-out session is refused by every process from the next
 * request on, not after some delay. Pushing an expiry forward alone does not raise it.
 */
export function sessionMiddleware(ds: DataSource, config: ApiConfig): RequestHandler {
  const PgStore = keptAndThrottled(connectPgSimple(session), ds);
  // TypeORM's postgres driver keeps its pg.Pool as `master`; the store shares it.
  const pool = (ds.driver as unknown as { master: pg.Pool }).master;
  const handler = session({
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
  return (req, res, next) => asking.run(req, () => handler(req, res, next));
}

type StoreClass = ReturnType<typeof connectPgSimple>;
type Callback = (err?: unknown, sess?: session.SessionData | null) => void;

interface Kept {
  json: string;
  /** The `access` counter the session was read at. */
  version: string;
  /** Never later than the expiry stored in the database. */
  expiresAt: number;
}

const expiryOf = (sess: session.SessionData): number => (sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : 0);

/**
 * The store, reading a session from memory while the `access` counter it was read at stands and
 * it has not expired, and with `touch` skipped while this process wrote the session's expiry less
 * than TOUCH_EVERY_SECONDS ago.
 */
function keptAndThrottled(Store: StoreClass, ds: DataSource): StoreClass {
  const touched = new Map<string, number>();
  const kept = new Map<string, Kept>();
  return class extends Store {
    override get(sid: string, fn: Callback): void {
      const req = asking.getStore();
      if (!req) return super.get(sid, fn);
      versionsOf(ds, req).then(
        ({ access }) => {
          const found = kept.get(sid);
          if (found && found.version === access && found.expiresAt > Date.now()) return fn(null, JSON.parse(found.json) as session.SessionData);
          super.get(sid, (err?: unknown, sess?: session.SessionData | null) => {
            if (err || !sess) kept.delete(sid);
            else {
              if (kept.size >= KEPT_SESSIONS_MAX) kept.clear();
              kept.set(sid, { json: JSON.stringify(sess), version: access, expiresAt: expiryOf(sess) });
            }
            fn(err, sess);
          });
        },
        (err: unknown) => fn(err),
      );
    }

    override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
      kept.delete(sid);
      super.set(sid, sess, fn);
    }

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
        else {
          const found = kept.get(sid);
          if (found) found.expiresAt = Math.max(found.expiresAt, expiryOf(sess));
        }
        fn?.(err);
      });
    }

    override destroy(sid: string, fn?: (err?: unknown) => void): void {
      touched.delete(sid);
      kept.delete(sid);
      super.destroy(sid, fn);
    }
  };
}
