/**
 * Number formatting for figures on screen and in exports. Estimates and limits keep four
 * significant digits (so a reader can round to whatever precision a report prints); counts are
 * whole numbers with thousands separators; infinities and undefined values are spelled out.
 */
const sig4 = new Intl.NumberFormat('en-GB', { minimumSignificantDigits: 4, maximumSignificantDigits: 4, useGrouping: true });
const whole = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0 });
const plain = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 });

export const NOT_DEFINED = 'not defined';

export function formatEstimate(x: number | null | undefined): string {
  if (x === null || x === undefined || Number.isNaN(x)) return NOT_DEFINED;
  if (x === Infinity) return '∞';
  if (x === -Infinity) return '−∞';
  if (x === 0) return '0';
  // Very large values would print as 1,234,000 with 4 significant digits: show them whole.
  if (Math.abs(x) >= 10_000) return whole.format(x);
  return sig4.format(x);
}

/** "0.3840 to 0.5489"; an undefined limit says so. */
export function formatInterval(i: { lower: number | null; upper: number | null }): string {
  return `${formatEstimate(i.lower)} to ${formatEstimate(i.upper)}`;
}

export function formatCount(x: number): string {
  return whole.format(x);
}

/** Person-time and other inputs echoed back: up to two decimals, grouped. */
export function formatAmount(x: number): string {
  return plain.format(x);
}

/** p-values: three significant digits, very small ones as "< 0.0001". */
export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || Number.isNaN(p)) return NOT_DEFINED;
  if (p < 0.0001) return '< 0.0001';
  return String(Number(p.toPrecision(3)));
}

/** A fraction 0.7505 as "75.05%". */
export function formatPercent(x: number | null | undefined): string {
  if (x === null || x === undefined || Number.isNaN(x)) return NOT_DEFINED;
  if (x === -Infinity) return '−∞';
  if (x === Infinity) return '∞';
  return `${formatEstimate(x * 100)}%`;
}
