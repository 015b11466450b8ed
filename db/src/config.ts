import { z } from 'zod';

/** Database settings, parsed once. `DATABASE_URL` is set by the start and test scripts. */
const schema = z.object({
  DATABASE_URL: z.string().url().default('postgres://ratewarden@127.0.0.1:54329/ratewarden').describe('PostgreSQL connection string'),
  DB_POOL_MAX: z.coerce.number().int().positive().default(20).describe('connections per process (API and worker each; PostgreSQL allows 100 by default)'),
  DB_POOL_WAIT_MS: z.coerce.number().int().positive().default(3_000).describe('longest wait for a free connection before the request is answered 503'),
  DB_QUEUE_MAX: z.coerce
    .number()
    .int()
    .min(0)
    .default(100)
    .describe('requests allowed to wait for a connection; beyond this the API answers 503 with Retry-After at once'),
});

export type DbConfig = z.infer<typeof schema>;

export function readDbConfig(env: NodeJS.ProcessEnv = process.env): DbConfig {
  return schema.parse(env);
}
