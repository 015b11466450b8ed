import type { RequestHandler } from 'express';
import rateLimit, { ipKeyGenerator } from 'express-rate-limit';

/**
 * A per-address limit on the sign-in routes. The address is the socket's unless TRUST_PROXY names
 * the proxy in front (Express's `trust proxy`), so a client cannot pick a fresh one per request.
 */
export function signInRateLimit(limit: number): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => {
      res.status(429).json({ code: 'rate_limited', message: 'too many sign-in attempts; wait a few minutes' });
    },
  });
}

/**
 * A per-principal limit on intake submissions (files are large; a runaway HR job should not fill
 * the database). Reads are not limited. Keyed by client or person, else by address.
 */
export function intakeRateLimit(limit: number): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skip: (req) => req.method === 'GET' || req.method === 'HEAD',
    keyGenerator: (req) => {
      const p = req.principal;
      return p?.kind === 'client' ? `client:${p.clientId}` : p?.kind === 'user' ? `user:${p.id}` : `ip:${ipKeyGenerator(req.ip ?? '')}`;
    },
    handler: (_req, res) => {
      res.status(429).json({ code: 'rate_limited', message: 'too many intake requests; wait a few minutes and try again' });
    },
  });
}
