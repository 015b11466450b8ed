import { z } from 'zod';
import { patchSchemaOf } from './patch-schema';
import { DEFAULT_SMALL_CELL_THRESHOLD } from './small-cells';
import { windowKindSchema } from './windows';

/**
 * Watch rules: what a run's results are compared with to raise flags.
 *
 * - `measure`: the IRR or IRD against the reference group, the group's own rate, a u-chart
 *   point above its upper control limit, or the SIR against the external reference rates (its
 *   exact lower limit with `lower_bound`; over all the person-time the reference rates cover, read
 *   when the rule's window has a complete period, one period at a time).
 * - `thresholdOn`: the point estimate, or the lower bound of its interval (exact conditional for
 *   the IRR, exact Poisson for the rate, Wald for the IRD), e.g. "IRR lower 95% bound above 1.0".
 *   Rates and IRDs are in the run's units (its person-time basis and multiplier).
 * - `minCases`, `minExpected`: the group must have at least this many cases and this many
 *   expected at the reference rate (the u-chart centre line for `uchart`) before a flag is raised.
 *   `minCases` is at least the small-cell threshold (and is that by default): a rule that could
 *   fire on 1 to threshold − 1 cases would let a reader learn a withheld count from which rules
 *   raised a flag.
 * - `consecutivePeriods`: the rule must hold in this many consecutive periods ending at the
 *   latest one.
 * - `siteIds`: null for a company-wide rule (the company's results); else the chosen sites, each
 *   evaluated on its own results (a site's excess that the company's figures dilute). Only a
 *   person who reads every site may write a company-wide rule; others choose among their sites.
 * - `fdrControl`: Benjamini–Hochberg at `fdrLevel` (on by default) over one family per rule and
 *   period: every group the rule covers × every site it watches (the company for a company-wide
 *   rule). It does not apply to u-chart rules, whose 3-sigma limits already fix the false-alarm
 *   rate per point.
 */
export const ruleMeasureSchema = z.enum(['irr', 'ird', 'rate', 'uchart', 'sir']);
export type RuleMeasure = z.infer<typeof ruleMeasureSchema>;

export const thresholdOnSchema = z.enum(['estimate', 'lower_bound']);
export type ThresholdOn = z.infer<typeof thresholdOnSchema>;

/**
 * The windows a watch rule reads: a single month or the rolling 12 months, which have a row at
 * every month (consecutive periods are consecutive months). The calendar quarter, calendar year and
 * whole period (shared/src/windows.ts) are for reading results, not for rules.
 */
export const ruleWindowSchema = windowKindSchema.extract(['month', 'rolling12']);
export type RuleWindow = z.infer<typeof ruleWindowSchema>;

/** Messages people read in the rule form (the server sends the same ones). */
const aNumber = { error: 'enter a number, e.g. 1.5' };
const aWholeNumber = (min: number, max: number) => ({ error: `enter a whole number from ${min} to ${max.toLocaleString('en-GB')}` });

const ruleFields = (smallCellThreshold: number) =>
  z.strictObject({
    name: z.string().trim().min(1, 'give the rule a name').max(120, 'at most 120 characters'),
    outcomeId: z.number({ error: 'choose an outcome' }).int().positive(),
    /** null: every exposure group except the reference group. */
    exposureGroupId: z.number().int().positive().nullable().default(null),
    /** null: the whole company; else the sites watched (kept sorted, each once). */
    siteIds: z
      .array(z.number({ error: 'choose a site' }).int().positive())
      .min(1, 'choose at least one site, or watch the whole company')
      .max(500, 'at most 500 sites')
      .transform((ids) => [...new Set(ids)].sort((a, b) => a - b))
      .nullable()
      .default(null),
    measure: ruleMeasureSchema,
    thresholdOn: thresholdOnSchema.default('lower_bound'),
    /** Required except for `uchart`, whose threshold is the upper control limit itself. */
    threshold: z.number(aNumber).finite(aNumber).nullable().default(null),
    minCases: z
      .number(aWholeNumber(smallCellThreshold, 100_000))
      .int(aWholeNumber(smallCellThreshold, 100_000))
      .min(smallCellThreshold, `at least ${smallCellThreshold}: smaller counts are withheld from everyone but the physician`)
      .max(100_000, aWholeNumber(smallCellThreshold, 100_000))
      .default(smallCellThreshold),
    minExpected: z.number(aNumber).min(0, 'enter 0 or more').max(100_000, 'at most 100,000').default(0),
    window: ruleWindowSchema.default('rolling12'),
    consecutivePeriods: z.number(aWholeNumber(1, 24)).int(aWholeNumber(1, 24)).min(1, aWholeNumber(1, 24)).max(24, aWholeNumber(1, 24)).default(1),
    fdrControl: z.boolean().default(true),
    fdrLevel: z.number(aNumber).gt(0, 'between 0 and 1, e.g. 0.05').lt(1, 'between 0 and 1, e.g. 0.05').default(0.05),
    recipients: z
      .array(z.string().trim().toLowerCase().pipe(z.email('not an e-mail address')))
      .max(50, 'at most 50 recipients')
      .default([]),
    active: z.boolean().default(true),
  });

function checkRule(r: { measure: RuleMeasure; threshold: number | null; window: RuleWindow }, ctx: z.RefinementCtx): void {
  if (r.measure !== 'uchart' && r.threshold === null) {
    ctx.addIssue({ code: 'custom', path: ['threshold'], message: 'a threshold is required for this measure' });
  }
  if ((r.measure === 'irr' || r.measure === 'sir') && r.threshold !== null && r.threshold < 0) {
    ctx.addIssue({ code: 'custom', path: ['threshold'], message: 'a rate ratio threshold cannot be negative' });
  }
  if (r.measure === 'uchart' && r.window !== 'month') {
    ctx.addIssue({ code: 'custom', path: ['window'], message: 'u-chart rules work on single months' });
  }
}

/**
 * The bodies of POST /api/rules and PATCH /api/rules/:id for a server whose small-cell threshold
 * is `smallCellThreshold` (the API's SMALL_CELL_THRESHOLD; the web app has it from the session).
 * A patch is any subset, nothing defaulted; the merged rule is validated again.
 */
export function watchRuleSchemas(smallCellThreshold: number = DEFAULT_SMALL_CELL_THRESHOLD) {
  const fields = ruleFields(smallCellThreshold);
  return { input: fields.superRefine(checkRule), patch: patchSchemaOf(fields) };
}

/** The bodies at the default threshold (5), for types and callers that have no configured one. */
export const { input: watchRuleInputSchema, patch: watchRulePatchSchema } = watchRuleSchemas();
export type WatchRuleInput = z.input<typeof watchRuleInputSchema>;
export type WatchRulePatch = z.input<typeof watchRulePatchSchema>;

/** Checks a complete rule after a patch has been merged into it. */
export const watchRuleCompleteSchema = z
  .object({ measure: ruleMeasureSchema, threshold: z.number().nullable(), window: ruleWindowSchema })
  .superRefine(checkRule);

/** A stored rule as the API returns it. */
export const watchRuleSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  outcomeId: z.number().int(),
  exposureGroupId: z.number().int().nullable(),
  siteIds: z.array(z.number().int()).nullable(),
  measure: ruleMeasureSchema,
  thresholdOn: thresholdOnSchema,
  threshold: z.number().nullable(),
  minCases: z.number().int(),
  minExpected: z.number(),
  window: ruleWindowSchema,
  consecutivePeriods: z.number().int(),
  fdrControl: z.boolean(),
  fdrLevel: z.number(),
  recipients: z.array(z.string()),
  active: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type WatchRule = z.infer<typeof watchRuleSchema>;

/** The family Benjamini–Hochberg controls for a rule, as one sentence (the rule form shows it; the README says the same). */
export function fdrFamilySentence(siteIds: readonly number[] | null): string {
  const family =
    siteIds === null
      ? 'every exposure group the rule covers, on the company’s results'
      : 'every exposure group the rule covers × every chosen site, each on its own results';
  return `False discovery control (Benjamini–Hochberg) holds the rate over one family per period: ${family}.`;
}
