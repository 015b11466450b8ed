/**
 * Month arithmetic, the one copy every process uses: calendar months as first-of-month ISO dates
 * (`YYYY-MM-01`) or as consecutive integers (year × 12 + month − 1), so that windows are plain
 * ranges. No Date objects: a calendar month is never shifted by a time zone.
 */

/** The month of an ISO date or `YYYY-MM` as a consecutive integer (year × 12 + month − 1). */
export function monthIndex(iso: string): number {
  return Number(iso.slice(0, 4)) * 12 + Number(iso.slice(5, 7)) - 1;
}

/** Inverse of monthIndex: the first day of the month as an ISO date. */
export function monthIso(index: number): string {
  const year = Math.floor(index / 12);
  const month = index - year * 12 + 1;
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-01`;
}

/** The first day of the month `n` months after (before, when negative) the month of `month`. */
export function addMonths(month: string, n: number): string {
  return monthIso(monthIndex(month) + n);
}

/** Months from the month of `from` to the month of `to` (0 for the same month, negative when `to` is earlier). */
export function monthsBetween(from: string, to: string): number {
  return monthIndex(to) - monthIndex(from);
}
