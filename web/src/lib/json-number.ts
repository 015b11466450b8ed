/**
 * The API sends infinite values as the strings "Infinity" / "-Infinity" (the statistics core's
 * JSON convention) and undefined ones as null; the screen wants plain numbers.
 */
export function toNumber(x: number | string | null | undefined): number | null {
  if (x === null || x === undefined) return null;
  if (typeof x === 'number') return x;
  if (x === 'Infinity') return Infinity;
  if (x === '-Infinity') return -Infinity;
  const n = Number(x);
  return Number.isNaN(n) ? null : n;
}
