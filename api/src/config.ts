import { z } from 'zod';

const DEMO_SESSION_SECRET = 'ratewarden-demo-session-secret';
const DEMO_CLIENT_SECRET = 'ratewarden-web-demo-secret';

/**
 * Express's `trust proxy`: off (the socket's address is the client's), a number of proxy hops, or
 * a list of proxy addresses and subnets (`loopback`, `uniquelocal`, `10.0.0.0/8`, ...).
 */
const trustProxySchema = z
  .string()
  .trim()
  .transform((s): boolean | number | string[] => {
    if (s === '' || /^(false|off|no|0)$/i.test(s)) return false;
    if (/^(true|on|yes)$/i.test(s)) return true;
    if (/^\d+$/.test(s)) return Number(s);
    return s
      .split(',')
      .map((x) => x.trim())
      .filter(Boolean);
  });

/** API settings, parsed once at start; nothing else reads process.env. */
const schema = z.object({
  PORT: z.coerce.number().int().min(1).max(65535).default(3000).describe('port of the web app and API on 127.0.0.1'),
  HOST: z.string().default('127.0.0.1').describe('address to listen on'),
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  WEB_DIST: z.string().optional().describe('folder of the built web app (default web/dist)'),
  APP_BASE_URL: z.string().url().default('http://127.0.0.1:3000/').describe('public address of the web app, for links and redirects'),
  OIDC_ISSUER: z.string().url().default('http://127.0.0.1:3001').describe('OpenID Connect issuer (discovery at /.well-known/openid-configuration)'),
  OIDC_CLIENT_ID: z.string().default('ratewarden-web'),
  OIDC_CLIENT_SECRET: z.string().min(8).default(DEMO_CLIENT_SECRET),
  OIDC_REDIRECT_URI: z.string().url().default('http://127.0.0.1:3000/auth/callback'),
  OIDC_API_AUDIENCE: z.string().default('urn:ratewarden:api').describe("audience integration clients' access tokens must carry"),
  SESSION_SECRET: z.string().min(16).default(DEMO_SESSION_SECRET),
  SESSION_HOURS: z.coerce.number().positive().default(8),
  TRUST_PROXY: trustProxySchema
    .default(false)
    .describe('which proxies may set X-Forwarded-For (off: none, so a client cannot choose the address rate limits and the audit log see)'),
  AUTH_RATE_LIMIT: z.coerce.number().int().positive().default(60).describe('sign-in attempts per IP per 15 minutes'),
  INTAKE_RATE_LIMIT: z.coerce.number().int().positive().default(120).describe('intake requests per client per 15 minutes'),
  INTAKE_MAX_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(512 * 1024 * 1024)
    .describe('largest roster or case file accepted, in bytes'),
  INTAKE_ALLOW_FUTURE_MONTHS: z
    .enum(['0', '1'])
    .default('0')
    .transform((v) => v === '1')
    .describe('1 takes in months (and onset dates) after the current month'),
  INTAKE_EXPIRY_HOURS: z.coerce
    .number()
    .positive()
    .default(24)
    .describe('hours a checked intake waits for apply before it expires and its staged rows are dropped'),
  RUN_QUIET_SECONDS: z.coerce
    .number()
    .int()
    .min(0)
    .default(180)
    .describe("the worker's quiet interval before an intake's run (the worker reads the same setting); the API says when a waiting run comes"),
  RUN_ANSWER_CACHE_MB: z.coerce.number().min(0).default(64).describe('memory for run answers kept serialised and gzipped, ready to send again (0 keeps none)'),
  HEARING_AGE_CORRECTION: z
    .enum(['0', '1'])
    .default('1')
    .transform((v) => v === '1')
    .describe(
      '1 applies the age correction of 29 CFR 1910.95 Appendix F when deriving standard threshold shifts from audiograms (the regulation allows it; 0 compares thresholds as measured)',
    ),
  HEARING_OUTCOME_CODE: z
    .string()
    .min(1)
    .default('STS')
    .describe('code of the outcome whose suspected cases the standard threshold shifts derived from audiograms become'),
  SMALL_CELL_THRESHOLD: z.coerce
    .number()
    .int()
    .min(3)
    .default(5)
    .describe('case counts below this are suppressed in results for every role but the physician (at least 3: with 2, a withheld count could only be 1)'),
});

export type ApiConfig = z.infer<typeof schema>;

export function readApiConfig(env: NodeJS.ProcessEnv = process.env): ApiConfig {
  const config = schema.parse(env);
  if (config.NODE_ENV === 'production' && usesDemoSecrets(config)) {
    throw new Error('refusing to start in production with the documented demo secrets: set SESSION_SECRET and OIDC_CLIENT_SECRET');
  }
  return config;
}

export function usesDemoSecrets(c: Pick<ApiConfig, 'SESSION_SECRET' | 'OIDC_CLIENT_SECRET'>): boolean {
  return c.SESSION_SECRET === DEMO_SESSION_SECRET || c.OIDC_CLIENT_SECRET === DEMO_CLIENT_SECRET;
}
