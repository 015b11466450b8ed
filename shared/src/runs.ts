import { z } from 'zod';
import { caseStatusSchema } from './intake';
import { monthIsoSchema, windowKindSchema, windowKinds } from './windows';
import { unattributedCountSchema } from './unattributed';
import { completenessSchema, completeThroughSchema } from './periods';

/**
 * Runs and their results as the API returns them. Numbers that the statistics core may make
 * infinite (an IRR with no reference cases, an exact upper limit) travel as the strings
 * "Infinity" / "-Infinity" (the core's JSON convention); null means undefined.
 */
export const jsonNumberSchema = z.union([z.number(), z.literal('Infinity'), z.literal('-Infinity')]);

/**
 * How a run turns hours into person-time: person-years at 2,000 h, or units of 200,000 hours
 * (the OSHA/BLS convention: 100 full-time workers for a year). `per` multiplies the rate
 * (1,000 → per 1,000 person-years; 1 with the 200,000-hour basis → the OSHA rate).
 */
export const personTimeBasisSchema = z.enum(['person_years', 'hours_200k']);
export type PersonTimeBasis = z.infer<typeof personTimeBasisSchema>;

/** Ten-year bands (0–9, 10–19, … 90 and over): the bands of runs before the edges were a setting. */
export const DECADE_AGE_BAND_EDGES: readonly number[] = [10, 20, 30, 40, 50, 60, 70, 80, 90];

/**
 * Lower edges of the age bands after the first: with edges 18, 25, 65 the bands are under 18,
 * 18–24, 25–64 and 65 and over. Any increasing list of whole years (shared/src/age-bands.ts).
 */
export const ageBandEdgesSchema = z
  .array(z.number().int().min(1).max(120))
  .min(1)
  .max(30)
  .refine((e) => e.every((x, i) => i === 0 || x > e[i - 1]!), 'age band edges must increase');

export const runSettingsSchema = z.object({
  personTimeBasis: personTimeBasisSchema.default('person_years'),
  per: z.number().positive().default(1000),
  confidence: z.number().gt(0).lt(1).default(0.95),
  countedStatuses: z.array(caseStatusSchema).min(1).default(['confirmed']),
  /** Absent (runs before the edges were a setting, callers that do not choose): ten-year bands. */
  ageBandEdges: ageBandEdgesSchema.optional(),
  /** The analysis windows a run computes (shared/src/windows.ts); absent (versions before windows were a setting): month and rolling 12 months. */
  windows: z.array(windowKindSchema).optional(),
  /** First month of the whole-period window (YYYY-MM-01); only with `whole` among the windows. */
  wholePeriodStart: monthIsoSchema.nullable().optional(),
});
export type RunSettings = z.infer<typeof runSettingsSchema>;

export const runTriggerSchema = z.enum(['schedule', 'request', 'cli', 'bench']);
export type RunTrigger = z.infer<typeof runTriggerSchema>;

export const runStateSchema = z.enum(['running', 'succeeded', 'failed']);
export type RunState = z.infer<typeof runStateSchema>;

export const runInputsSchema = z.object({
  rosterIntakeIds: z.array(z.string()),
  caseIntakeIds: z.array(z.string()),
  requestIds: z.array(z.string()),
});
export type RunInputs = z.infer<typeof runInputsSchema>;

export const runSummarySchema = z.object({
  id: z.string().uuid(),
  number: z.number().int(),
  trigger: runTriggerSchema,
  reason: z.string().nullable(),
  state: runStateSchema,
  isCurrent: z.boolean(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  error: z.string().nullable(),
  codeVersion: z.string(),
  /** The version of the analysis settings the run used (null for runs before settings had versions). */
  settingsVersion: z.number().int().nullable(),
  resultCount: z.number().int().nullable(),
});
export type RunSummary = z.infer<typeof runSummarySchema>;

export const runDetailSchema = runSummarySchema.extend({
  inputs: runInputsSchema,
  settings: runSettingsSchema,
  worker: z.string(),
  /** Counts and timings: cells, results, flags raised, cases that matched no roster row, seconds. */
  summary: z.record(z.string(), z.unknown()),
  /**
   * Per outcome, the counted cases no roster row attributes, by reason; small counts withheld for
   * everyone but the physician. Null when the run did not record them (runs before they were
   * recorded, failed runs), or for a reader outside the figures: company-wide, so for readers of
   * every site; of the current run, except for the physician.
   */
  unattributed: z.array(unattributedCountSchema).nullable(),
  /** The latest complete month when the run read its data (shared/src/periods.ts), in the reader's scope. */
  completeThrough: completeThroughSchema.nullable(),
});
export type RunDetail = z.infer<typeof runDetailSchema>;

export const withheldSchema = z.enum(['small', 'complement', 'months', 'strata', 'earlier']);

const limits = { estimate: jsonNumberSchema.nullable(), lower: jsonNumberSchema.nullable(), upper: jsonNumberSchema.nullable() };

/**
 * Small-cell suppression (every role but the physician): a count below the threshold is null with
 * `suppressed: true`, and every figure that would give it back (rate and its limits, comparisons,
 * adjusted measures, u-chart values, detail) is null too; `comparisonSuppressed` marks a row whose
 * own count is shown but whose reference group's count is small, so its comparisons are withheld.
 */
export const runResultSchema = z.object({
  /** null: the whole company; else results computed from that site's cells alone. */
  siteId: z.number().int().nullable(),
  outcomeId: z.number().int(),
  exposureGroupId: z.number().int(),
  window: windowKindSchema,
  /** The last month of the window (ISO date, first of the month; shared/src/windows.ts). */
  period: z.string(),
  monthsCovered: z.number().int(),
  isReference: z.boolean(),
  referenceGroupId: z.number().int().nullable(),
  cases: z.number().int().nullable(),
  suppressed: z.boolean(),
  /** Why the count is withheld: small itself, or the complement of a small one elsewhere (see small-cells.ts). */
  withheld: withheldSchema.nullable(),
  comparisonSuppressed: z.boolean(),
  hours: z.string(),
  personTime: z.number(),
  rate: z.object(limits),
  expected: z.number().nullable(),
  irr: z.object({ ...limits, p: z.number().nullable(), waldLower: jsonNumberSchema.nullable(), waldUpper: jsonNumberSchema.nullable() }),
  ird: z.object({ ...limits, p: z.number().nullable() }),
  mhAge: z.object({ irr: z.object({ ...limits, p: z.number().nullable() }), ird: z.object(limits) }),
  mhSite: z.object({ irr: z.object({ ...limits, p: z.number().nullable() }), ird: z.object(limits) }),
  mhSex: z.object({ irr: z.object({ ...limits, p: z.number().nullable() }), ird: z.object(limits) }),
  uChart: z.object({
    centre: z.number().nullable(),
    lcl: z.number().nullable(),
    ucl: z.number().nullable(),
    signal: z.enum(['above', 'below', 'within']).nullable(),
  }),
  detail: z.record(z.string(), z.unknown()),
  /** Whether every month of the window was complete in the row's scope when the run read its data (shared/src/periods.ts). */
  completeness: completenessSchema,
});
export type RunResult = z.infer<typeof runResultSchema>;

/** Query of GET /api/runs/:id/periods: the periods of one outcome's window, in one scope. */
export const runPeriodIndexQuerySchema = z.object({
  siteId: z.coerce.number().int().positive().optional(),
  outcomeId: z.coerce.number().int().positive(),
  window: windowKindSchema,
});
export type RunPeriodIndexQuery = z.infer<typeof runPeriodIndexQuerySchema>;

/**
 * What a results page needs to choose its period without reading the figures: each period of the
 * window, newest first, whether it was complete when the run read its data, and whether the
 * reader sees every group's count in it (none kept back for being read by calendar year) or some.
 */
export const runPeriodIndexSchema = z.object({
  window: windowKindSchema,
  periods: z.array(z.object({ period: z.string(), completeness: completenessSchema, everyGroupShown: z.boolean(), someGroupShown: z.boolean() })),
});
export type RunPeriodIndex = z.infer<typeof runPeriodIndexSchema>;

/** Query of GET /api/runs/:id/results. */
export const runResultsQuerySchema = z.object({
  /** Results of one site; without it, the company-wide results (for people who see every site). */
  siteId: z.coerce.number().int().positive().optional(),
  outcomeId: z.coerce.number().int().positive().optional(),
  exposureGroupId: z.coerce.number().int().positive().optional(),
  window: windowKindSchema.optional(),
  /** Several windows, comma-separated (the trends page: its window and the months of its control chart). */
  windows: z
    .string()
    .transform((s) => s.split(','))
    .pipe(z.array(windowKindSchema).min(1).max(windowKinds.length))
    .optional(),
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
});
export type RunResultsQuery = z.infer<typeof runResultsQuerySchema>;

/** Query of GET /api/runs/diff. */
export const runDiffQuerySchema = z.object({ from: z.string().uuid(), to: z.string().uuid(), siteId: z.coerce.number().int().positive().optional() });

/** A count as a reader may see it, with its hours and the rate computed from it (null with a withheld count). */
const shownCountFields = {
  cases: z.number().int().nullable(),
  withheld: withheldSchema.nullable(),
  hours: z.string(),
  rate: jsonNumberSchema.nullable(),
};

/** One side of a changed cell in a run diff; a withheld count goes with its rate and IRR. */
const diffSideSchema = z.object({ ...shownCountFields, suppressed: z.boolean(), irr: jsonNumberSchema.nullable() });

export const runDiffRowSchema = z.object({
  outcomeId: z.number().int(),
  exposureGroupId: z.number().int(),
  window: windowKindSchema,
  period: z.string(),
  change: z.enum(['added', 'removed', 'changed']),
  before: diffSideSchema.nullable(),
  after: diffSideSchema.nullable(),
});
export const runDiffSchema = z.object({
  from: runSummarySchema,
  to: runSummarySchema,
  settingsChanged: z.boolean(),
  unchangedCount: z.number().int(),
  rows: z.array(runDiffRowSchema),
});
export type RunDiff = z.infer<typeof runDiffSchema>;

/** Answer of POST /api/runs: the request the worker will pick up. */
export const runRequestedSchema = z.object({ requestId: z.string(), requestedAt: z.string() });
export type RunRequested = z.infer<typeof runRequestedSchema>;

/**
 * GET /api/runs/pending: run requests not yet taken up, and when the worker runs them (after the
 * latest has been quiet for RUN_QUIET_SECONDS, at once for the run button); null when none wait.
 */
export const pendingRunSchema = z.object({
  pending: z.object({ count: z.number().int(), immediate: z.boolean(), latestAt: z.string(), dueAt: z.string() }).nullable(),
});
export type PendingRunAnswer = z.infer<typeof pendingRunSchema>;

/** The stratifications a run adjusts by. */
export const stratificationSchema = z.enum(['age', 'site', 'sex']);
export type Stratification = z.infer<typeof stratificationSchema>;

/** GET /api/runs/:id/strata: one exposure group against its reference group, stratum by stratum. */
export const runStrataQuerySchema = z.object({
  outcomeId: z.coerce.number().int().positive(),
  exposureGroupId: z.coerce.number().int().positive(),
  window: windowKindSchema,
  /** The last month of the window (first of the month; shared/src/windows.ts). */
  period: z.string().regex(/^\d{4}-\d{2}-01$/, 'a month as YYYY-MM-01'),
  by: stratificationSchema,
  siteId: z.coerce.number().int().positive().optional(),
});
export type RunStrataQuery = z.infer<typeof runStrataQuerySchema>;

/** One arm (the group, or the reference group) in one stratum; a withheld count goes with its rate. */
const stratumArmSchema = z.object({ ...shownCountFields, personTime: z.number() });

export const runStratumSchema = z.object({
  /** The stratum's key as stored: age band lower bound, site id or sex code; null when unknown. */
  key: z.string().nullable(),
  label: z.string(),
  exposed: stratumArmSchema,
  reference: stratumArmSchema.nullable(),
  /** The stratum's own IRR (exact conditional limits) and IRD (Wald limits); null when an arm's count is withheld. */
  irr: z.object(limits).nullable(),
  ird: z.object(limits).nullable(),
});
export type RunStratum = z.infer<typeof runStratumSchema>;

export const runStrataSchema = z.object({
  by: stratificationSchema,
  siteId: z.number().int().nullable(),
  exposureGroupId: z.number().int(),
  referenceGroupId: z.number().int().nullable(),
  strata: z.array(runStratumSchema),
  methods: z.object({ irr: z.string(), ird: z.string() }),
});
export type RunStrata = z.infer<typeof runStrataSchema>;
