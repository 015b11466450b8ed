import { z } from 'zod';

/** Database settings, parsed once. `DATABASE_URL` is set by the start and test scripts. */
const schema = z.object({
  DATABASE_URL: z
    .string()
    .url()
    .default('postgres://ratewarden@127.0.0.1:54329/ratewarden')
    .describe('PostgreSQL connection string'),
  DB_POOL_MAX: z.coerce.number().int().positive().default(10).describe('connections per process'),
});

export type DbConfig = z.infer<typeof schema>;

export function readDbConfig(env: NodeJS.ProcessEnv = process.env): DbConfig {
  return schema.parse(env);
}
