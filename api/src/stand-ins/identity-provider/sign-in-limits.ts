import type { Request, RequestHandler } from 'express';
import rateLimit, { ipKeyGenerator } from 'express-rate-limit';
import type { IdpConfig } from './config';
import { tooManyAttemptsPage } from './pages';

/**
 * Failed password attempts are limited per account and per address, as a hosted identity service
 * does: past the limit, the account (or the address) is locked out for the rest of the window and
 * every attempt, the right password included, gets a 429 page. Successful sign-ins do not count.
 */
export function signInAttemptLimits(
  config: Pick<IdpConfig, 'IDP_FAILED_SIGN_INS_PER_ACCOUNT' | 'IDP_FAILED_SIGN_INS_PER_ADDRESS' | 'IDP_LOCKOUT_MINUTES'>,
): RequestHandler[] {
  const windowMs = config.IDP_LOCKOUT_MINUTES * 60_000;
  const limiter = (limit: number, keyGenerator: (req: Request) => string, what: string) =>
    rateLimit({
      windowMs,
      limit,
      keyGenerator,
      skipSuccessfulRequests: true,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, res) => {
        res.status(429).type('html').send(tooManyAttemptsPage(what, config.IDP_LOCKOUT_MINUTES));
      },
    });
  return [
    limiter(config.IDP_FAILED_SIGN_INS_PER_ADDRESS, (req) => `address:${ipKeyGenerator(req.ip ?? '')}`, 'from this address'),
    limiter(
      config.IDP_FAILED_SIGN_INS_PER_ACCOUNT,
      (req) =>
        `account:${String(req.body?.email ?? '')
          .trim()
          .toLowerCase()}`,
      'for this account',
    ),
  ];
}
