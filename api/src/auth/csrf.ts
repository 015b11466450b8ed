import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { AppError } from '../lib/app-error';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** The session's synchronizer token, made at sign-in (or on first need for an older signed-in session); never for anonymous readers. */
export function csrfTokenOf(req: Request): string {
  if (!req.session.csrfToken) req.session.csrfToken = randomBytes(24).toString('base64url');
  return req.session.csrfToken;
}

/**
 * Every state-changing request that rides on a signed-in session must carry the session's token in
 * `x-csrf-token` (or a `_csrf` form field). Without a signed-in person there is nothing to forge
 * (the route's guard answers 401); bearer-token requests carry no cookie and are exempt.
 */
export const csrfProtection: RequestHandler = (req, _res, next) => {
  if (SAFE.has(req.method) || req.principal?.kind !== 'user') return next();
  const expected = req.session?.csrfToken;
  const given = req.get('x-csrf-token') ?? (typeof req.body?._csrf === 'string' ? req.body._csrf : undefined);
  if (!expected || !given || given.length !== expected.length || !timingSafeEqual(Buffer.from(given), Buffer.from(expected))) {
    return next(new AppError('forbidden', 'missing or stale security token; reload the page and try again', { reason: 'csrf' }));
  }
  next();
};
