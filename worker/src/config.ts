import cron from 'node-cron';
import { z } from 'zod';

/** Worker settings, parsed once at start. */
const schema = z.object({
  RUN_SCHEDULE: z
    .string()
    .default('0 2 * * *')
    .refine((s) => cron.validate(s), 'RUN_SCHEDULE is not a valid cron expression')
    .describe('when the nightly run starts (cron syntax, minute first)'),
  RUN_TIMEZONE: z.string().default('UTC').describe('IANA time zone of RUN_SCHEDULE, e.g. Europe/Berlin'),
});

export type WorkerConfig = z.infer<typeof schema>;

export function readWorkerConfig(env: NodeJS.ProcessEnv = process.env): WorkerConfig {
  return schema.parse(env);
}
