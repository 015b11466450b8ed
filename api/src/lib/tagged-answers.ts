import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import { AnswerCache } from './answer-cache';

/** Who asks, as far as an answer may depend on it: the person with their role and sites, or the client. */
export function readerKey(req: Request): string {
  const p = req.principal!;
  return p.kind === 'user' ? `user|${p.id}|${p.role ?? ''}|${p.siteIds.join(',')}` : `client|${p.clientId}`;
}

/**
 * Answers that depend only on the address asked, who asks (readerKey) and `versions` (what the
 * data they read is at: a run id, a data_versions counter, a threshold...). The ETag is a hash of
 * exactly these; `Cache-Control: private, no-cache` makes the browser ask again every time, and a
 * matching If-None-Match is answered 304 before anything is read. Other answers are kept,
 * serialised and gzipped, under the same tag (answer-cache.ts), so a page many readers load is
 * read and compressed once per reader and version.
 */
export class TaggedAnswers {
  private readonly cache: AnswerCache;

  constructor(
    private readonly kind: string,
    budgetBytes: number,
  ) {
    this.cache = new AnswerCache(budgetBytes);
  }

  /** Answers `req` with what `read` gives, from the browser's copy or this process's when it can. */
  send(req: Request, res: Response, versions: ReadonlyArray<string | number | null>, read: () => Promise<unknown>): Promise<void> {
    const tag = `"${this.kind}-${createHash('sha256')
      .update([...versions.map((v) => String(v ?? 'none')), readerKey(req), req.originalUrl].join('\n'))
      .digest('base64url')
      .slice(0, 27)}"`;
    res.set('etag', tag);
    res.set('cache-control', 'private, no-cache');
    res.vary('cookie');
    const given = req.get('if-none-match');
    if (given && given.split(',').some((t) => t.trim() === tag || t.trim() === `W/${tag}`)) {
      res.status(304).end();
      return Promise.resolve();
    }
    return this.cache.get(tag, read).then((answer) => {
      res.vary('accept-encoding');
      res.type('application/json');
      // Already compressed: the compression middleware leaves an answer with a Content-Encoding alone.
      if (req.acceptsEncodings('gzip', 'identity') === 'gzip') res.set('content-encoding', 'gzip').send(answer.gzip);
      else res.send(answer.json);
    });
  }
}
