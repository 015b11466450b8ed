/**
 * Incidence rate of one group: cases / person-time × per, with the exact (Garwood), mid-p
 * and Byar limits.
 *
 * @example
 * incidenceRate({ cases: 10, personTime: 1000 }, { per: 1000 })
 * // { estimate: 10, exact: { lower: 4.795388696132435, upper: 18.39035604201778 },
 * //   midP: { lower: 5.079521847217346, upper: 17.82485369656968 },
 * //   byar: { lower: 4.787449913967564, upper: 18.391458605756473 },
 * //   confidence: 0.95, per: 1000, methods: { exact: 'exact Poisson (Garwood 1936)', ... }, reasons: [] }
 */
import { METHODS } from './methods';
import { poissonByarLimits, poissonExactLimits, poissonMidPLimits, type PoissonLimits } from './poisson-limits';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { assertCasesHavePersonTime, assertConfidence, assertCount, assertNonNegative, assertPositive } from './validation';

export interface RateGroup {
  cases: number;
  personTime: number;
}

export interface RateOptions {
  /** Confidence level, default 0.95. */
  confidence?: number;
  /** Multiplier of the rate (1000 for "per 1,000 person-years"), default 1. */
  per?: number;
}

export interface IncidenceRateResult {
  estimate: number | null;
  exact: Interval;
  midP: Interval;
  byar: Interval;
  confidence: number;
  per: number;
  methods: { exact: string; midP: string; byar: string };
  reasons: Reason[];
}

/** Resolve and validate the common options. @example resolveRateOptions({}) // { confidence: 0.95, per: 1 } */
export function resolveRateOptions(options: RateOptions = {}): { confidence: number; per: number } {
  const confidence = options.confidence ?? 0.95;
  const per = options.per ?? 1;
  assertConfidence(confidence);
  assertPositive('per', per);
  return { confidence, per };
}

/** Validate one group of person-time data. @example validateRateGroup('exposed', { cases: 1, personTime: 2 }) // undefined */
export function validateRateGroup(path: string, group: RateGroup): void {
  assertCount(`${path}.cases`, group.cases);
  assertNonNegative(`${path}.personTime`, group.personTime);
  assertCasesHavePersonTime(path, group.cases, group.personTime);
}

function scale(limits: PoissonLimits, factor: number): Interval {
  return { lower: limits.lower * factor, upper: limits.upper * factor };
}

/**
 * Incidence rate λ̂ = x / T × per with Garwood exact, mid-p and Byar limits (limits on the
 * Poisson mean divided by T). T = 0 leaves the rate undefined.
 *
 * @example
 * incidenceRate({ cases: 0, personTime: 1 }).exact // { lower: 0, upper: 3.6888794541139354 }
 */
export function incidenceRate(group: RateGroup, options: RateOptions = {}): IncidenceRateResult {
  validateRateGroup('group', group);
  const { confidence, per } = resolveRateOptions(options);
  const methods = { exact: METHODS.rateExact, midP: METHODS.rateMidP, byar: METHODS.rateByar };
  const reasons: Reason[] = [];
  if (group.personTime === 0) {
    undefinedBecause(reasons, 'estimate', 'no person-time');
    return { estimate: null, exact: nullInterval(), midP: nullInterval(), byar: nullInterval(), confidence, per, methods, reasons };
  }
  const factor = per / group.personTime;
  return {
    estimate: group.cases * factor, // λ̂ = x/T × per (METHODS.md §1)
    exact: scale(poissonExactLimits(group.cases, confidence), factor),
    midP: scale(poissonMidPLimits(group.cases, confidence), factor),
    byar: scale(poissonByarLimits(group.cases, confidence), factor),
    confidence,
    per,
    methods,
    reasons,
  };
}
