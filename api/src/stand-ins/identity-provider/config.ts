import { z } from 'zod';

const list = z.string().transform((s) =>
  s
    .split(',')
    .map((x) => x.trim())
    .filter(Boolean),
);

/** Settings of the stand-in identity provider; defaults fit `npm start` on loopback. */
const schema = z.object({
  IDP_PORT: z.coerce.number().int().min(1).max(65535).default(3001),
  IDP_ISSUER: z.string().url().optional().describe('defaults to http://127.0.0.1:IDP_PORT'),
  OIDC_CLIENT_ID: z.string().default('ratewarden-web'),
  OIDC_CLIENT_SECRET: z.string().min(8).default('ratewarden-web-demo-secret'),
  OIDC_REDIRECT_URI: z.string().url().default('http://127.0.0.1:3000/auth/callback'),
  APP_BASE_URL: z.string().url().default('http://127.0.0.1:3000/'),
  HR_CLIENT_ID: z.string().default('hr-sync-demo'),
  HR_CLIENT_SECRET: z.string().min(8).default('demo-secret'),
  API_AUDIENCE: z.string().default('urn:ratewarden:api'),
  ACCESS_TOKEN_TTL_SECONDS: z.coerce.number().int().positive().default(600),
  IDP_EXTRA_REDIRECT_URIS: list.default([]),
  IDP_FAILED_SIGN_INS_PER_ACCOUNT: z.coerce.number().int().positive().default(10).describe('wrong passwords for one account before it is locked out'),
  IDP_FAILED_SIGN_INS_PER_ADDRESS: z.coerce.number().int().positive().default(50).describe('wrong passwords from one address before it is locked out'),
  IDP_LOCKOUT_MINUTES: z.coerce.number().int().positive().default(15).describe('the window the failures are counted in, and the lockout'),
});

export type IdpConfig = z.infer<typeof schema> & { issuer: string };

export function readIdpConfig(env: NodeJS.ProcessEnv = process.env): IdpConfig {
  const c = schema.parse(env);
  return { ...c, issuer: c.IDP_ISSUER ?? `http://127.0.0.1:${c.IDP_PORT}` };
}
