/**
 * u-chart for rates (Montgomery, Introduction to Statistical Quality Control, u charts):
 * centre line ū = Σcᵢ/Σnᵢ and, for each period, UCLᵢ = ū + 3√(ū/nᵢ), LCLᵢ = max(0, ū − 3√(ū/nᵢ)).
 * For injury rates nᵢ = hoursᵢ/200,000, so uᵢ is the OSHA rate. Exact Poisson probability limits
 * (the 0.00135 and 0.99865 quantiles of Poisson(ū nᵢ), divided by nᵢ) are given beside them,
 * because with small expected counts the 3-sigma LCL is 0 and the false-alarm rate is asymmetric.
 *
 * @example
 * uChart([{ count: 2, exposure: 1 }, { count: 6, exposure: 1 }]).centre // 4
 */
import { poissonQuantile } from './distributions';
import { METHODS } from './methods';
import { undefinedBecause, type Reason } from './result-types';
import { assertCount, assertNonNegative, StatsValidationError } from './validation';

export interface UChartPeriod {
  count: number;
  /** Exposure in the chart's unit (e.g. hours/200,000). */
  exposure: number;
}

export interface UChartPoint {
  u: number | null;
  lcl: number | null;
  ucl: number | null;
  exactLcl: number | null;
  exactUcl: number | null;
  /** 'above' / 'below' the 3-sigma limits, 'within', or null when undefined. */
  signal: 'above' | 'below' | 'within' | null;
}

export interface UChartResult {
  centre: number | null;
  points: UChartPoint[];
  methods: { limits: string; exact: string };
  reasons: Reason[];
}

/** 3-sigma tail probabilities Φ(−3) and Φ(3), to the customary 5 decimals (Montgomery; common practice). */
export const U_CHART_EXACT_TAILS = [0.00135, 0.99865] as const;

/**
 * u-chart centre line and limits for each period.
 *
 * @example
 * uChart([{ count: 2, exposure: 1 }, { count: 6, exposure: 1 }]).points[0]
 * // { u: 2, lcl: 0, ucl: 10, exactLcl: 0, exactUcl: 11, signal: 'within' }
 */
export function uChart(periods: UChartPeriod[]): UChartResult {
  if (!Array.isArray(periods) || periods.length === 0) throw new StatsValidationError([{ path: 'periods', message: 'must be a non-empty list of periods' }]);
  periods.forEach((p, i) => {
    assertCount(`periods[${i}].count`, p.count);
    assertNonNegative(`periods[${i}].exposure`, p.exposure);
  });
  const methods = { limits: METHODS.uChart, exact: METHODS.uChartExact };
  const reasons: Reason[] = [];
  const totalExposure = periods.reduce((s, p) => s + p.exposure, 0);
  const totalCount = periods.reduce((s, p) => s + p.count, 0);
  if (totalExposure === 0) {
    undefinedBecause(reasons, 'centre', 'no exposure in any period');
    return { centre: null, points: periods.map(() => ({ u: null, lcl: null, ucl: null, exactLcl: null, exactUcl: null, signal: null })), methods, reasons };
  }
  const centre = totalCount / totalExposure; // ū = Σc/Σn (Montgomery)
  const points = periods.map((p, i): UChartPoint => {
    if (p.exposure === 0) {
      undefinedBecause(reasons, `points[${i}]`, 'no exposure in this period');
      return { u: null, lcl: null, ucl: null, exactLcl: null, exactUcl: null, signal: null };
    }
    const u = p.count / p.exposure;
    const sigma = Math.sqrt(centre / p.exposure);
    const ucl = centre + 3 * sigma; // UCL = ū + 3√(ū/n) (Montgomery)
    const lcl = Math.max(0, centre - 3 * sigma); // LCL = max(0, ū − 3√(ū/n))
    const mean = centre * p.exposure;
    const exactLcl = mean === 0 ? 0 : poissonQuantile(U_CHART_EXACT_TAILS[0], mean) / p.exposure;
    const exactUcl = mean === 0 ? 0 : poissonQuantile(U_CHART_EXACT_TAILS[1], mean) / p.exposure;
    const signal = u > ucl ? 'above' : u < lcl ? 'below' : 'within';
    return { u, lcl, ucl, exactLcl, exactUcl, signal };
  });
  return { centre, points, methods, reasons };
}
