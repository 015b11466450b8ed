import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import type { DataSource } from 'typeorm';

/**
 * Conditional reads of run figures. A run's results never change once stored, so what a reader
 * gets from a run route depends only on the address asked, the run that is current (a reader
 * other than the physician may read the current run only), who asks (role and sites) and the
 * small-count threshold. The ETag is a hash of exactly these; `Cache-Control: private, no-cache`
 * makes the browser ask again every time, and a matching If-None-Match is answered 304 after one
 * small query, before any figure is read.
 */
export async function answeredFromCache(ds: DataSource, req: Request, res: Response, smallCellThreshold: number): Promise<boolean> {
  const [current] = (await ds.query(`SELECT run_id::text AS id FROM current_run`)) as Array<{ id: string }>;
  const p = req.principal!;
  const who = p.kind === 'user' ? `${p.id}|${p.role ?? ''}|${p.siteIds.join(',')}` : `client|${p.clientId}`;
  const tag = `"run-${createHash('sha256').update([current?.id ?? 'none', who, smallCellThreshold, req.originalUrl].join('\n')).digest('base64url').slice(0, 27)}"`;
  res.set('etag', tag);
  res.set('cache-control', 'private, no-cache');
  res.vary('cookie');
  const asked = req.get('if-none-match');
  if (asked && asked.split(',').some((t) => t.trim() === tag || t.trim() === `W/${tag}`)) {
    res.status(304).end();
    return true;
  }
  return false;
}
