import cron from 'node-cron';
import { z } from 'zod';
import { caseStatusSchema, type CaseStatus } from '@ratewarden/shared/intake';
import { ageBandEdgesSchema, DECADE_AGE_BAND_EDGES, personTimeBasisSchema } from '@ratewarden/shared/runs';

/**
 * Worker settings, parsed once at start. The RUN_* analysis settings (basis, multiplier,
 * confidence, counted statuses, age band edges) only seed a new database: once a version of the
 * analysis settings exists (the settings page), runs use it (runs/analysis-settings.ts).
 */
const schema = z.object({
  RUN_SCHEDULE: z
    .string()
    .default('0 2 * * *')
    .refine((s) => cron.validate(s), 'RUN_SCHEDULE is not a valid cron expression')
    .describe('when the nightly run starts (cron syntax, minute first)'),
  RUN_TIMEZONE: z.string().default('UTC').describe('IANA time zone of RUN_SCHEDULE, e.g. Europe/Berlin'),
  RUN_POLL_MS: z.coerce.number().int().min(50).default(5_000).describe('how often the worker looks for run requests (after an intake, the run button)'),
  RUN_QUIET_SECONDS: z.coerce
    .number()
    .int()
    .min(0)
    .default(180)
    .describe("seconds without a new run request before an intake's request is run, so a roster and its case list give one run; the run button does not wait"),
  RULES_ON_PARTIAL_PERIODS: z
    .enum(['true', 'false', '1', '0'])
    .default('false')
    .transform((s) => s === 'true' || s === '1')
    .describe('let watch rules look at partial periods too (a month without its roster or case list); off by default'),
  RUN_PERSON_TIME_BASIS: personTimeBasisSchema.default('person_years').describe('person_years (2,000 h) or hours_200k (OSHA/BLS 200,000 hours)'),
  RUN_PER: z.coerce.number().positive().default(1000).describe('rate multiplier: 1000 = per 1,000 person-years; 1 with hours_200k = the OSHA rate'),
  RUN_CONFIDENCE: z.coerce.number().gt(0).lt(1).default(0.95).describe('confidence level of every interval'),
  RUN_COUNTED_STATUSES: z
    .string()
    .default('confirmed')
    .transform((s, ctx): CaseStatus[] => {
      const parsed = z
        .array(caseStatusSchema)
        .min(1)
        .safeParse(
          s
            .split(',')
            .map((x) => x.trim())
            .filter(Boolean),
        );
      if (!parsed.success) {
        ctx.addIssue({ code: 'custom', message: 'RUN_COUNTED_STATUSES must list suspected, confirmed and/or ruled_out' });
        return z.NEVER;
      }
      return parsed.data;
    })
    .describe('case statuses a run counts, comma-separated'),
  RUN_AGE_BAND_EDGES: z
    .string()
    .default(DECADE_AGE_BAND_EDGES.join(','))
    .transform((s, ctx): number[] => {
      const parsed = ageBandEdgesSchema.safeParse(
        s
          .split(',')
          .map((x) => x.trim())
          .filter(Boolean)
          .map(Number),
      );
      if (!parsed.success) {
        ctx.addIssue({ code: 'custom', message: 'RUN_AGE_BAND_EDGES must be an increasing list of whole years, e.g. 18,25,35,45,55,65' });
        return z.NEVER;
      }
      return parsed.data;
    })
    .describe('lower edges of the age bands after the first, comma-separated (default 10,20,…,90: ten-year bands)'),
  SMALL_CELL_THRESHOLD: z.coerce
    .number()
    .int()
    .min(3)
    .default(5)
    .describe('in notices to anyone but a physician, case counts below this are withheld with the figures computed from them (as in the app)'),
  SMTP_HOST: z.string().default('127.0.0.1').describe('SMTP server the notices go to (the local fake in development)'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525).describe('port of the SMTP server'),
  SMTP_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((s) => s === 'true')
    .describe('TLS from the first byte (port 465 style)'),
  SMTP_USER: z.string().optional().describe('SMTP user name, when the server wants one'),
  SMTP_PASS: z.string().optional().describe('SMTP password'),
  NOTICE_FROM: z.string().default('Ratewarden <notices@ratewarden.invalid>').describe('From address of threshold notices'),
  APP_BASE_URL: z.string().url().default('http://127.0.0.1:3000/').describe('address of the web app, for the sign-in link in notices'),
  NOTICE_POLL_MS: z.coerce.number().int().min(50).default(5_000).describe('how often the sender looks at the outbox'),
  NOTICE_RETRY_BASE_MS: z.coerce.number().int().min(10).default(30_000).describe('first retry delay; doubles with every failed attempt'),
  NOTICE_RETRY_MAX_MS: z.coerce.number().int().min(10).default(3_600_000).describe('longest delay between attempts'),
  NOTICE_MAX_ATTEMPTS: z.coerce.number().int().min(1).default(20).describe('attempts before a notice is marked failed'),
  NOTICE_SENDING_LEASE_MS: z.coerce
    .number()
    .int()
    .min(50)
    .default(120_000)
    .describe(
      'how long a notice being sent is left to its sender before another sender resends it (same Message-ID); longer than an SMTP conversation can take',
    ),
});

export type WorkerConfig = z.infer<typeof schema>;

export function readWorkerConfig(env: NodeJS.ProcessEnv = process.env): WorkerConfig {
  return schema.parse(env);
}
