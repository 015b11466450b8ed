/** Months as consecutive integers (year × 12 + month − 1), so windows are plain ranges. */
export function monthIndex(iso: string): number {
  const year = Number(iso.slice(0, 4));
  const month = Number(iso.slice(5, 7));
  return year * 12 + month - 1;
}

/** Inverse of monthIndex: the first day of the month as an ISO date. */
export function monthIso(index: number): string {
  const year = Math.floor(index / 12);
  const month = (index % 12) + 1;
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-01`;
}
