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

/** Sessions kept in PostgreSQL (table user_sessions), so any API process can serve any request. */
export function sessionMiddleware(ds: DataSource, config: ApiConfig): RequestHandler {
  const PgStore = connectPgSimple(session);
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
