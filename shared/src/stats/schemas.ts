/**
 * Zod schemas for the request shapes of the core, exported so that the API and the UI
 * validate exactly what the core accepts. Counts are non-negative integers, person-time and
 * expected counts finite and ≥ 0, the confidence strictly inside (0, 1) (default 0.95), the rate
 * multiplier `per` finite and > 0 (default 1). Unknown keys are rejected, so a misspelt option
 * is an error instead of being silently ignored.
 *
 * @example
 * parseStatsRequest({ kind: 'poisson', count: 10 }) // { kind: 'poisson', count: 10, confidence: 0.95 }
 */
import { z } from 'zod';
import { StatsValidationError } from './validation';

export const countSchema = z.number().int('must be an integer count').nonnegative('must be ≥ 0');
export const nonNegativeSchema = z.number().nonnegative('must be ≥ 0');
export const confidenceSchema = z.number().gt(0, 'must be > 0').lt(1, 'must be < 1').default(0.95);
export const perSchema = z.number().positive('must be > 0').default(1);

export const rateGroupSchema = z
  .strictObject({ cases: countSchema, personTime: nonNegativeSchema })
  .refine((g) => !(g.cases > 0 && g.personTime === 0), { message: 'cases > 0 with zero person-time' });

export const riskGroupSchema = z.strictObject({ cases: countSchema, total: countSchema }).refine((g) => g.cases <= g.total, { message: 'cases exceed total' });

export const ratesRequestSchema = z.strictObject({
  kind: z.literal('rates'),
  exposed: rateGroupSchema,
  reference: rateGroupSchema,
  confidence: confidenceSchema,
  per: perSchema,
});

export const rateStratumSchema = z.strictObject({ exposed: rateGroupSchema, reference: rateGroupSchema });

export const stratifiedRatesRequestSchema = z.strictObject({
  kind: z.literal('stratified-rates'),
  strata: z.array(rateStratumSchema).min(1, 'needs at least one stratum'),
  confidence: confidenceSchema,
  per: perSchema,
});

export const trendLevelSchema = z
  .strictObject({ score: z.number(), cases: countSchema, personTime: nonNegativeSchema })
  .refine((g) => !(g.cases > 0 && g.personTime === 0), { message: 'cases > 0 with zero person-time' });

export const trendRequestSchema = z.strictObject({
  kind: z.literal('trend'),
  levels: z.array(trendLevelSchema).min(2, 'needs at least two levels'),
  confidence: confidenceSchema,
  per: perSchema,
});

export const sirRequestSchema = z.strictObject({
  kind: z.literal('sir'),
  observed: countSchema,
  expected: nonNegativeSchema,
  confidence: confidenceSchema,
});

export const poissonRequestSchema = z.strictObject({
  kind: z.literal('poisson'),
  count: countSchema,
  confidence: confidenceSchema,
});

export const risksRequestSchema = z.strictObject({
  kind: z.literal('risks'),
  exposed: riskGroupSchema,
  reference: riskGroupSchema,
  confidence: confidenceSchema,
});

export const riskStratumSchema = z.strictObject({ exposed: riskGroupSchema, reference: riskGroupSchema });

export const stratifiedRisksRequestSchema = z.strictObject({
  kind: z.literal('stratified-risks'),
  strata: z.array(riskStratumSchema).min(1, 'needs at least one stratum'),
  confidence: confidenceSchema,
});

export const statsRequestSchema = z.discriminatedUnion('kind', [
  ratesRequestSchema,
  stratifiedRatesRequestSchema,
  trendRequestSchema,
  sirRequestSchema,
  poissonRequestSchema,
  risksRequestSchema,
  stratifiedRisksRequestSchema,
]);

export type StatsRequest = z.output<typeof statsRequestSchema>;
export type StatsRequestInput = z.input<typeof statsRequestSchema>;

/**
 * Validate a request; throws StatsValidationError listing every issue with its path.
 *
 * @example
 * parseStatsRequest({ kind: 'sir', observed: -1, expected: 2 })
 * // throws StatsValidationError: "observed: must be ≥ 0"
 */
export function parseStatsRequest(input: unknown): StatsRequest {
  const result = statsRequestSchema.safeParse(input);
  if (result.success) return result.data;
  throw new StatsValidationError(result.error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message })));
}
