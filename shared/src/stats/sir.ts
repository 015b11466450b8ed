/**
 * Standardized incidence ratio SIR = O/E, where E = Σ (reference rate × person-time) over
 * strata, with the exact limits of Ulm (1990) (Garwood limits on O divided by E), the mid-p
 * limits and Byar's approximation, and the exact Poisson test of SIR = 1.
 *
 * @example
 * standardizedIncidenceRatio(12, 7.4).sir // 1.6216216216216215
 */
import { poissonLowerTail, poissonPmf, poissonUpperTail } from './distributions';
import { METHODS } from './methods';
import { poissonByarLimits, poissonExactLimits, poissonMidPLimits } from './poisson-limits';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { assertConfidence, assertCount, assertNonNegative, StatsValidationError } from './validation';
import { MIN_LIKELIHOOD_RELATIVE_TOLERANCE } from './binomial-tests';

export interface SirResult {
  observed: number;
  expected: number;
  sir: number | null;
  exact: Interval;
  midP: Interval;
  byar: Interval;
  /** Exact p, twice the smaller one-sided Poisson tail. */
  pExact: number | null;
  /** Exact p by the minimum-likelihood rule (as R poisson.test). */
  pExactMinLikelihood: number | null;
  confidence: number;
  methods: { exact: string; midP: string; byar: string; pExact: string; pExactMinLikelihood: string };
  reasons: Reason[];
}

export interface SirStratum {
  /** Observed cases in the stratum (optional when the total is given separately). */
  observed?: number;
  personTime: number;
  /** Reference (standard population) rate per unit of person-time. */
  referenceRate: number;
}

/**
 * Expected count E = Σ referenceRateᵢ × personTimeᵢ (indirect standardization; Breslow & Day 1987 Vol II).
 * @example expectedCount([{ personTime: 1000, referenceRate: 0.002 }, { personTime: 500, referenceRate: 0.01 }]) // 7
 */
export function expectedCount(strata: SirStratum[]): number {
  if (!Array.isArray(strata) || strata.length === 0) throw new StatsValidationError([{ path: 'strata', message: 'must be a non-empty list of strata' }]);
  return strata.reduce((sum, s, i) => {
    assertNonNegative(`strata[${i}].personTime`, s.personTime);
    assertNonNegative(`strata[${i}].referenceRate`, s.referenceRate);
    return sum + s.referenceRate * s.personTime;
  }, 0);
}

/**
 * Minimum-likelihood two-sided Poisson p-value for x given mean μ (the rule of R's poisson.test,
 * from memory): the total probability of the counts no more likely than x.
 *
 * @example
 * poissonMinLikelihoodP(0, 1) // 1 (P(X = 0) = P(X = 1), and every other count is less likely)
 */
export function poissonMinLikelihoodP(x: number, mu: number): number {
  if (mu === 0) return x === 0 ? 1 : 0;
  if (x === mu) return 1;
  const d = poissonPmf(x, mu) * MIN_LIKELIHOOD_RELATIVE_TOLERANCE;
  if (x < mu) {
    // Far side k ≥ ceil(μ), where the pmf decreases: find the first k with pmf ≤ d by doubling then bisection.
    let lo = Math.ceil(mu);
    if (poissonPmf(lo, mu) <= d) return Math.min(1, poissonLowerTail(x, mu) + poissonUpperTail(lo, mu));
    let hi = lo + 1;
    while (poissonPmf(hi, mu) > d) hi = lo + 2 * (hi - lo);
    while (hi - lo > 1) {
      const mid = Math.floor((lo + hi) / 2);
      if (poissonPmf(mid, mu) > d) lo = mid;
      else hi = mid;
    }
    return Math.min(1, poissonLowerTail(x, mu) + poissonUpperTail(hi, mu));
  }
  // Far side k ≤ floor(μ), where the pmf increases: find the last k with pmf ≤ d.
  let lo = -1;
  let hi = Math.floor(mu) + 1;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (poissonPmf(mid, mu) <= d) lo = mid;
    else hi = mid;
  }
  return Math.min(1, poissonUpperTail(x, mu) + (lo >= 0 ? poissonLowerTail(lo, mu) : 0));
}

/**
 * SIR with exact (Ulm), mid-p and Byar limits:
 * lower = χ²_{α/2}(2O)/(2E), upper = χ²_{1−α/2}(2O + 2)/(2E) (Ulm 1990; Garwood 1936);
 * Byar as for a Poisson rate with T = E (Rothman & Boice 1979). E = 0 leaves everything undefined.
 *
 * @example
 * standardizedIncidenceRatio(0, 2).exact // { lower: 0, upper: 1.8444397270569677 }
 */
export function standardizedIncidenceRatio(observed: number, expected: number, confidence = 0.95): SirResult {
  assertCount('observed', observed);
  assertNonNegative('expected', expected);
  assertConfidence(confidence);
  const methods = {
    exact: METHODS.sirExact,
    midP: METHODS.sirMidP,
    byar: METHODS.sirByar,
    pExact: 'exact Poisson, twice the smaller one-sided tail',
    pExactMinLikelihood: 'exact Poisson, minimum-likelihood two-sided',
  };
  const reasons: Reason[] = [];
  if (expected === 0) {
    for (const f of ['sir', 'exact', 'midP', 'byar', 'pExact', 'pExactMinLikelihood']) undefinedBecause(reasons, f, 'expected count is 0');
    return {
      observed,
      expected,
      sir: null,
      exact: nullInterval(),
      midP: nullInterval(),
      byar: nullInterval(),
      pExact: null,
      pExactMinLikelihood: null,
      confidence,
      methods,
      reasons,
    };
  }
  const div = (l: { lower: number; upper: number }): Interval => ({ lower: l.lower / expected, upper: l.upper / expected });
  const lower = poissonLowerTail(observed, expected);
  const upper = poissonUpperTail(observed, expected);
  if (observed < 10) reasons.push({ field: 'byar', reason: 'fewer than 10 observed: Byar is only a display approximation, prefer exact' });
  return {
    observed,
    expected,
    sir: observed / expected, // SIR = O/E
    exact: div(poissonExactLimits(observed, confidence)),
    midP: div(poissonMidPLimits(observed, confidence)),
    byar: div(poissonByarLimits(observed, confidence)),
    pExact: Math.min(1, 2 * Math.min(lower, upper)),
    pExactMinLikelihood: poissonMinLikelihoodP(observed, expected),
    confidence,
    methods,
    reasons,
  };
}
