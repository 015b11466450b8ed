/**
 * How a rate chart's value axis is bounded, as pure functions. A linear axis stops at a robust
 * maximum so one outlying month (a small denominator, a wide interval) does not flatten the rest:
 * Tukey's far-out fence, Q3 + 3·IQR of the values drawn (Tukey, Exploratory Data Analysis, 1977,
 * ch. 2), rounded up to a 1-2-2.5-5 step; points above it are drawn at the edge and marked. A log
 * axis runs between powers of ten around the positive values, so its ticks read 0.1, 1, 10, 100.
 */
export type RateScale = 'linear' | 'log';

/** The smallest number of the form m·10^k with m in {1, 2, 2.5, 5, 10} at or above x (x > 0). */
export function niceCeil(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) return 1;
  const k = Math.floor(Math.log10(x));
  const base = 10 ** k;
  for (const m of [1, 2, 2.5, 5, 10]) {
    const v = m * base;
    if (v >= x * (1 - 1e-12)) return Number(v.toPrecision(12));
  }
  return 10 * base;
}

/** Quartile by linear interpolation between order statistics (Hyndman & Fan type 7, R's default). */
export function quantile(sorted: number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.ceil(h);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

export interface LinearAxis {
  max: number;
  /** True when some value lies above `max` and is drawn at the edge with a marker. */
  clipped: boolean;
}

/** With fewer than five values there is no telling an outlier from the rest: the axis covers all. */
export function linearAxis(values: number[]): LinearAxis {
  const v = values.filter((x) => Number.isFinite(x) && x >= 0).sort((a, b) => a - b);
  if (v.length === 0) return { max: 1, clipped: false };
  const top = v[v.length - 1]!;
  if (v.length < 5) return { max: niceCeil(top), clipped: false };
  const q1 = quantile(v, 0.25);
  const q3 = quantile(v, 0.75);
  const fence = q3 + 3 * (q3 - q1);
  if (top <= fence || fence <= 0) return { max: niceCeil(top), clipped: false };
  const max = niceCeil(fence);
  return { max, clipped: top > max };
}

export interface LogAxis {
  min: number;
  max: number;
}

/** Powers of ten around the positive values; zero rates have no place on it and are left out. */
export function logAxis(values: number[]): LogAxis {
  const v = values.filter((x) => Number.isFinite(x) && x > 0);
  if (v.length === 0) return { min: 0.1, max: 10 };
  const min = 10 ** Math.floor(Math.log10(Math.min(...v)));
  let max = 10 ** Math.ceil(Math.log10(Math.max(...v)));
  if (max <= min) max = min * 10;
  return { min: Number(min.toPrecision(12)), max: Number(max.toPrecision(12)) };
}
