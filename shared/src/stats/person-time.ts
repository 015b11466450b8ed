/**
 * Person-time conversions and the OSHA/BLS recordable-case rate.
 *
 * The OSHA/BLS incidence rate is N × 200,000 / EH, where EH is the hours actually worked by all
 * employees and 200,000 h = 100 full-time workers × 40 h × 50 weeks (OSHA 29 CFR Part 1904 forms
 * package, 300/300A instructions; BLS, "How to compute a firm's incidence rate for safety
 * management", bls.gov/iif). It is a Poisson rate per 200,000 hours, so its limits are the exact
 * limits on N scaled by 200,000/EH.
 *
 * @example
 * oshaRate(6, 300000).estimate // 4
 */
import { METHODS } from './methods';
import { poissonExactLimits } from './poisson-limits';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { assertCasesHavePersonTime, assertConfidence, assertCount, assertNonNegative, assertPositive } from './validation';

/** 200,000 hours: 100 full-time workers × 40 h × 50 weeks (29 CFR 1904; BLS). */
export const OSHA_BASE_HOURS = 200_000;
/** Hours in a full-time work year, 40 h × 50 weeks (the same convention as the OSHA base). */
export const FULL_TIME_HOURS_PER_YEAR = 2_000;
/** Days per year for day-based follow-up (Julian year; common practice). */
export const DAYS_PER_YEAR = 365.25;

/** Hours worked → person-years at 2,000 h per year. @example hoursToPersonYears(300000) // 150 */
export function hoursToPersonYears(hours: number, hoursPerYear = FULL_TIME_HOURS_PER_YEAR): number {
  assertNonNegative('hours', hours);
  assertPositive('hoursPerYear', hoursPerYear);
  return hours / hoursPerYear;
}

/** Months enrolled → person-years (12 months per year). @example monthsToPersonYears(18) // 1.5 */
export function monthsToPersonYears(months: number): number {
  assertNonNegative('months', months);
  return months / 12;
}

/** Days of follow-up → person-years (365.25 days per year; common practice). @example daysToPersonYears(730.5) // 2 */
export function daysToPersonYears(days: number): number {
  assertNonNegative('days', days);
  return days / DAYS_PER_YEAR;
}

/** Hours → "FTE-years" in 200,000-hour units, the person-time of the OSHA rate. @example hoursToOshaUnits(300000) // 1.5 */
export function hoursToOshaUnits(hours: number): number {
  assertNonNegative('hours', hours);
  return hours / OSHA_BASE_HOURS;
}

/** The two person-time bases of a run's settings: person-years at 2,000 h, or 200,000-hour units. */
export type HoursBasis = 'person_years' | 'hours_200k';

/** Hours worked → person-time on a basis. @example personTimeOfHours(300000, 'hours_200k') // 1.5 */
export function personTimeOfHours(hours: number, basis: HoursBasis): number {
  return basis === 'person_years' ? hoursToPersonYears(hours) : hoursToOshaUnits(hours);
}

export interface OshaRateResult {
  estimate: number | null;
  exact: Interval;
  confidence: number;
  methods: { estimate: string; exact: string };
  reasons: Reason[];
}

/**
 * OSHA/BLS recordable-case rate per 200,000 hours with exact Poisson limits on N.
 * rate = N × 200,000 / EH (29 CFR 1904; BLS); limits = Garwood limits on N × 200,000/EH.
 *
 * @example
 * oshaRate(1, 50000).exact // { lower: 0.10127123193715959, upper: 22.286573563755592 }
 */
export function oshaRate(cases: number, hours: number, confidence = 0.95): OshaRateResult {
  assertCount('cases', cases);
  assertNonNegative('hours', hours);
  assertCasesHavePersonTime('hours', cases, hours);
  assertConfidence(confidence);
  const methods = { estimate: 'N × 200,000 / hours worked (29 CFR 1904; BLS)', exact: METHODS.rateExact };
  const reasons: Reason[] = [];
  if (hours === 0) {
    undefinedBecause(reasons, 'estimate', 'no hours worked');
    return { estimate: null, exact: nullInterval(), confidence, methods, reasons };
  }
  const factor = OSHA_BASE_HOURS / hours;
  const limits = poissonExactLimits(cases, confidence);
  return {
    estimate: cases * factor, // N × 200,000 / EH (29 CFR 1904; BLS)
    exact: { lower: limits.lower * factor, upper: limits.upper * factor },
    confidence,
    methods,
    reasons,
  };
}
