import { z } from 'zod';

const port = (fallback: number) => z.coerce.number().int().min(1).max(65535).default(fallback);

/** Ports and switches the orchestration scripts read; every key is documented in the README. */
const schema = z.object({
  PORT: port(3000),
  PGPORT: port(54329),
  TEST_PGPORT: port(54339),
  IDP_PORT: port(3001),
  SMTP_PORT: port(2525),
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  /** Same as `npm start -- --empty`: a new database starts without the demo data. */
  RATEWARDEN_EMPTY: z
    .enum(['true', 'false', '1', '0'])
    .default('false')
    .transform((s) => s === 'true' || s === '1'),
  /** The first administrator of an empty start (signs in with this e-mail); by default the stand-in's demo administrator. */
  FIRST_ADMIN_EMAIL: z.string().email().default('admin@demo.ratewarden.test'),
});

export type Settings = z.infer<typeof schema>;

export function readSettings(env: NodeJS.ProcessEnv = process.env): Settings {
  return schema.parse(env);
}
