/**
 * Shapes shared by all results of the core, and the one policy for degenerate input:
 * a measure that cannot be computed is `null` and a `{ field, reason }` entry says why; a value
 * that is truly infinite (a rate ratio with no reference cases, an exact upper limit) is
 * `Infinity`, never a large finite number; no result ever contains NaN.
 *
 * @example
 * const reasons: Reason[] = [];
 * undefinedBecause(reasons, 'irr.wald', 'no cases in the reference group') // null
 * reasons // [{ field: 'irr.wald', reason: 'no cases in the reference group' }]
 */
export interface Reason {
  /** Dotted path of the result field that is null (or flagged), e.g. "irr.wald". */
  field: string;
  reason: string;
}

/** A two-sided confidence interval; a null limit is undefined (see the result's reasons). */
export interface Interval {
  lower: number | null;
  upper: number | null;
}

/** Record why a field is undefined and return null for it. */
export function undefinedBecause(reasons: Reason[], field: string, reason: string): null {
  reasons.push({ field, reason });
  return null;
}

/** An interval with both limits undefined. @example nullInterval() // { lower: null, upper: null } */
export function nullInterval(): Interval {
  return { lower: null, upper: null };
}

/** Prefix the field of nested reasons with a parent path. @example prefixReasons('crude', [{ field: 'irr', reason: 'x' }]) // [{ field: 'crude.irr', reason: 'x' }] */
export function prefixReasons(prefix: string, reasons: Reason[]): Reason[] {
  return reasons.map((r) => ({ field: `${prefix}.${r.field}`, reason: r.reason }));
}
