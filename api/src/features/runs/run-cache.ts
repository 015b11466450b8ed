import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import type { DataSource } from 'typeorm';
import { AnswerCache } from '../../lib/answer-cache';

/**
 * Reads of run figures. A run's results never change once stored, so what a reader gets from a
 * run route depends only on the address asked, the run that is current (a reader other than the
 * physician may read the current run only), who asks (role and sites) and the small-count
 * threshold. The ETag is a hash of exactly these; `Cache-Control: private, no-cache` makes the
 * browser ask again every time, and a matching If-None-Match is answered 304 after one small
 * query, before any figure is read. Other answers are kept, serialised and gzipped, under the
 * same tag (lib/answer-cache.ts), so a page many readers load is read and compressed once.
 */
export class RunAnswers {
  private readonly cache: AnswerCache;

  constructor(
    private readonly ds: DataSource,
    private readonly smallCellThreshold: number,
    budgetBytes: number,
  ) {
    this.cache = new AnswerCache(budgetBytes);
  }

  /** Answers `req` with what `read` gives, from the browser's copy or this process's when it can. */
  async send(req: Request, res: Response, read: () => Promise<unknown>): Promise<void> {
    const [current] = (await this.ds.query(`SELECT run_id::text AS id FROM current_run`)) as Array<{ id: string }>;
    const p = req.principal!;
    const who = p.kind === 'user' ? `${p.id}|${p.role ?? ''}|${p.siteIds.join(',')}` : `client|${p.clientId}`;
    const tag = `"run-${createHash('sha256')
      .update([current?.id ?? 'none', who, this.smallCellThreshold, req.originalUrl].join('\n'))
      .digest('base64url')
      .slice(0, 27)}"`;
    res.set('etag', tag);
    res.set('cache-control', 'private, no-cache');
    res.vary('cookie');
    const asked = req.get('if-none-match');
    if (asked && asked.split(',').some((t) => t.trim() === tag || t.trim() === `W/${tag}`)) {
      res.status(304).end();
      return;
    }
    const answer = await this.cache.get(tag, read);
    res.vary('accept-encoding');
    res.type('application/json');
    // Already compressed: the compression middleware leaves an answer with a Content-Encoding alone.
    if (req.acceptsEncodings('gzip', 'identity') === 'gzip') res.set('content-encoding', 'gzip').send(answer.gzip);
    else res.send(answer.json);
  }
}
