/**
 * The one number rule of Ratewarden, for everything a person reads: tables, chart axes and
 * tooltips, threshold notices. Three significant digits and no more than needed (no trailing
 * zeros), thousands separators, and whole numbers from 1,000 up (a count-like magnitude is never
 * rounded into invented zeros). So 0.03125 reads "0.0313", 1.80 reads "1.8", 127,650 stays
 * "127,650". Infinities and undefined values are spelled out. CSV exports keep full precision in
 * their numeric columns on purpose: they are for further calculation (web/DESIGN-TOKENS.md).
 */
export const SIGNIFICANT_DIGITS = 3;
export const NOT_DEFINED = 'not defined';

const significant = new Intl.NumberFormat('en-GB', { maximumSignificantDigits: SIGNIFICANT_DIGITS, useGrouping: true });
const whole = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 0, useGrouping: true });

export function formatFigure(x: number | null | undefined): string {
  if (x === null || x === undefined || Number.isNaN(x)) return NOT_DEFINED;
  if (x === Infinity) return '∞';
  if (x === -Infinity) return '−∞';
  if (x === 0 || Object.is(x, -0)) return '0';
  if (Math.abs(x) >= 1000) return whole.format(x);
  return significant.format(x);
}

/** Counts: whole numbers with thousands separators. */
export function formatCount(x: number): string {
  return whole.format(x);
}

/** "0.384 to 0.549"; an undefined limit says so. */
export function formatInterval(i: { lower: number | null; upper: number | null }): string {
  return `${formatFigure(i.lower)} to ${formatFigure(i.upper)}`;
}

/** p-values: the same three significant digits, and below 0.0001 only "< 0.0001". */
export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || Number.isNaN(p)) return NOT_DEFINED;
  if (p < 0.0001) return '< 0.0001';
  return formatFigure(p);
}

/** A fraction 0.7505 as "75.1%". */
export function formatPercent(x: number | null | undefined): string {
  if (x === null || x === undefined || Number.isNaN(x)) return NOT_DEFINED;
  if (!Number.isFinite(x)) return formatFigure(x);
  return `${formatFigure(x * 100)}%`;
}
