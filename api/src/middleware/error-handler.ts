import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Problem } from '@ratewarden/shared/domain';
import { ZodError } from 'zod';
import { AppError } from '../lib/app-error';
import { isPoolWaitTimeout, RETRY_AFTER_SECONDS } from './database-saturation';

/** Unknown routes under /api become a problem too, never Express's HTML page. */
export const notFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `no such route: ${req.method} ${req.path}`));
};

/** Turns anything thrown into `{ code, message, details? }`; internals are logged, never sent. */
export const errorHandler: ErrorRequestHandler = (err: unknown, req, res, _next) => {
  let problem: Problem;
  let status: number;
  if (err instanceof AppError) {
    status = err.status;
    problem = { code: err.code, message: err.message, ...(err.details === undefined ? {} : { details: err.details }) };
  } else if (err instanceof ZodError) {
    // Write bodies are strict objects: each unknown key becomes its own detail, named.
    const details = err.issues.flatMap((i) =>
      i.code === 'unrecognized_keys'
        ? i.keys.map((key) => ({ path: [...i.path, key].join('.'), message: `unknown field "${key}"` }))
        : [{ path: i.path.join('.'), message: i.message }],
    );
    const unknown = err.issues.flatMap((i) => (i.code === 'unrecognized_keys' ? i.keys : []));
    status = 422;
    problem = {
      code: 'validation_failed',
      message: unknown.length
        ? `the request is not valid: unknown field${unknown.length > 1 ? 's' : ''} ${unknown.map((k) => `"${k}"`).join(', ')}`
        : 'the request is not valid',
      details,
    };
  } else if (isPgError(err) && err.code.startsWith('22')) {
    // PostgreSQL data exceptions (a malformed id or date in the URL, a number out of range).
    status = 422;
    problem = { code: 'validation_failed', message: 'a value in the request is malformed or out of range' };
  } else if (isPoolWaitTimeout(err)) {
    // Every connection busy for longer than DB_POOL_WAIT_MS: overload, said as such.
    status = 503;
    problem = { code: 'service_unavailable', message: 'the database is busy; try again in a moment' };
    res.set('retry-after', String(RETRY_AFTER_SECONDS));
  } else if (isHttpError(err)) {
    // body-parser and friends throw errors carrying a status; keep the status, word the message ourselves.
    status = err.status;
    problem =
      err.status === 413
        ? { code: 'payload_too_large', message: 'the request body is too large' }
        : { code: 'bad_request', message: 'the request could not be read' };
  } else {
    status = 500;
    problem = { code: 'internal_error', message: 'something went wrong on the server; the error has been logged' };
    console.error(`${req.method} ${req.originalUrl} failed:`, err);
  }
  if (res.headersSent) return;
  res.status(status).type('application/json').json(problem);
};

function isPgError(err: unknown): err is { code: string } {
  return typeof err === 'object' && err !== null && 'code' in err && typeof err.code === 'string' && /^[0-9A-Z]{5}$/.test(err.code) && 'query' in err;
}

function isHttpError(err: unknown): err is { status: number } {
  return typeof err === 'object' && err !== null && 'status' in err && typeof err.status === 'number' && err.status >= 400 && err.status < 500;
}
