/**
 * Axis ends and ticks for a linear axis that must show `values` and 0 (no difference): steps of 1, 2
 * or 5 times a power of ten, about four to six of them, so a tick never reads like 0.03125.
 */
export interface LinearAxis {
  min: number;
  max: number;
  step: number;
  ticks: number[];
}

export function linearAxis(values: number[]): LinearAxis {
  const finite = values.filter((v) => Number.isFinite(v));
  const lo = Math.min(0, ...finite);
  // A zero-width span (no difference at all, or nothing finite) still gets an axis one unit wide.
  const hi = Math.max(0, ...finite) === lo ? lo + 1 : Math.max(0, ...finite);
  const range = hi - lo;
  const rough = range / 4;
  const power = 10 ** Math.floor(Math.log10(rough));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= rough) ?? 10 * power;
  const min = Math.floor(lo / step) * step;
  const max = Math.ceil(hi / step) * step;
  const ticks: number[] = [];
  // Rounded to the step's own decimals so 0.1 + 0.2 does not print as 0.30000000000000004.
  const decimals = Math.max(0, -Math.floor(Math.log10(step)));
  for (let i = 0; min + i * step <= max + step / 2; i++) ticks.push(Number((min + i * step).toFixed(decimals)));
  return { min: Number(min.toFixed(decimals)), max: Number(max.toFixed(decimals)), step, ticks };
}
