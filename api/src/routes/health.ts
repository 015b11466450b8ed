import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { RATEWARDEN_VERSION, type Health } from '@ratewarden/shared';

/** `/api/health`: 200 when the database answers, 503 with `db: "down"` when it does not. */
export function healthRouter(ds: DataSource): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    let db: Health['db'] = 'down';
    try {
      await Promise.race([ds.query('SELECT 1'), new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 3_000).unref())]);
      db = 'ok';
    } catch {
      db = 'down';
    }
    const body: Health = { status: db === 'ok' ? 'ok' : 'degraded', db, version: RATEWARDEN_VERSION };
    res.status(db === 'ok' ? 200 : 503).json(body);
  });
  return router;
}
