import { z } from 'zod';

/**
 * Small-cell suppression, shared by the API (which withholds) and the web (which explains).
 *
 * A count from 1 to threshold − 1 could point at an identifiable person and is withheld for every
 * role but the physician ("primary" suppression); zero points at nobody and is shown (common
 * practice in occupational and public-health reporting). Where parts and their total are both
 * published (each site and the whole company; the strata of one group), a withheld part could be
 * recovered by subtraction, so further parts are withheld to protect it ("complementary" or
 * secondary suppression, the usual remedy of statistical disclosure control: Hundepool et al.,
 * Statistical Disclosure Control, Wiley 2012, ch. 4, from memory).
 */

/** The threshold when none is configured: counts 1 to 4 are withheld (common practice). */
export const DEFAULT_SMALL_CELL_THRESHOLD = 5;

/**
 * Why a count is not shown: 'small' (below the threshold), 'complement' (it would give a small
 * one back), 'months' (single months and overlapping windows of a series with small months:
 * they would give the months back by difference; read its yearly windows), 'strata' (a stratum
 * table shown only in yearly windows without small strata), 'earlier' (a figure of an earlier
 * run: the current run's only, or the two would give counts back by difference).
 */
export type Withheld = 'small' | 'complement' | 'months' | 'strata' | 'earlier';

export function isSmallCount(count: number, threshold: number): boolean {
  return count > 0 && count < threshold;
}

export interface MarginSuppression {
  /** For each part: why it is withheld, or null when it is shown. */
  parts: Array<Withheld | null>;
  /** The total must be withheld too (no part was left to withhold instead). */
  total: boolean;
}

/**
 * Whether a reader who knows the published total, the shown parts, that each small part lies in
 * [1, threshold − 1] and each complementary one in [threshold, ∞) can narrow a small part below
 * that whole range: its largest feasible value is the withheld sum minus the other parts' lower
 * bounds, its smallest the withheld sum minus the others' upper bounds (none with a complement,
 * which is unbounded above). The labels alone allow 1 … threshold − 1; the values must not narrow it.
 */
function smallPartNarrowed(small: number[], complement: number[], threshold: number): boolean {
  const k = small.length;
  if (k === 0) return false;
  const sum = small.reduce((a, b) => a + b, 0) + complement.reduce((a, b) => a + b, 0);
  const upper = Math.min(threshold - 1, sum - (k - 1) - complement.length * threshold);
  const lower = complement.length > 0 ? 1 : Math.max(1, sum - (k - 1) * (threshold - 1));
  return upper < threshold - 1 || lower > 1;
}

/**
 * Suppression of the parts of one published total: the small parts, then, while a small part
 * could be narrowed by subtraction, the smallest shown part (ties: the first) as its complement;
 * when no shown part is left, the total is withheld instead.
 *
 * @example
 * marginSuppression([3, 7, 12], 5) // { parts: ['small', 'complement', null], total: false }
 */
export function marginSuppression(parts: number[], threshold: number): MarginSuppression {
  const out: Array<Withheld | null> = parts.map((c) => (isSmallCount(c, threshold) ? 'small' : null));
  const small = parts.filter((c) => isSmallCount(c, threshold));
  const total = parts.reduce((a, b) => a + b, 0);
  // A small total is withheld in its own right, and then nothing can be subtracted from it.
  if (small.length === 0 || isSmallCount(total, threshold)) return { parts: out, total: false };
  const complement: number[] = [];
  while (smallPartNarrowed(small, complement, threshold)) {
    let pick = -1;
    parts.forEach((c, i) => {
      if (out[i] === null && c > 0 && (pick < 0 || c < parts[pick]!)) pick = i;
    });
    if (pick < 0) return { parts: out, total: true };
    out[pick] = 'complement';
    complement.push(parts[pick]!);
  }
  return { parts: out, total: false };
}

/** Why a count of a split table is not shown: small, a complement, or 'total' (a part whose total is withheld goes with it). */
export const splitWithheldSchema = z.enum(['small', 'complement', 'total']);
export type SplitWithheld = z.infer<typeof splitWithheldSchema>;

export interface SplitSuppression {
  total: 'small' | 'complement' | null;
  parts: Array<SplitWithheld | null>;
}

/**
 * Suppression of a count split into parts, both published (a count by reason, by status): the
 * parts by marginSuppression; the total is withheld when it is small, or when no shown part is
 * left to protect a small one. A withheld total takes every part with it, zeros too, so that the
 * parts neither add up to it nor say which of them are empty (as a stratum table is shown whole
 * or not at all).
 *
 * @example
 * splitSuppression([6, 0, 7], 5) // { total: null, parts: [null, null, null] }
 * splitSuppression([2, 0, 1], 5) // { total: 'small', parts: ['total', 'total', 'total'] }
 */
export function splitSuppression(parts: number[], threshold: number): SplitSuppression {
  const margin = marginSuppression(parts, threshold);
  const sum = parts.reduce((a, b) => a + b, 0);
  const total = isSmallCount(sum, threshold) ? 'small' : margin.total ? 'complement' : null;
  // marginSuppression labels parts 'small' or 'complement' only.
  return total ? { total, parts: parts.map(() => 'total') } : { total: null, parts: margin.parts as Array<'small' | 'complement' | null> };
}

export interface NestedSuppression {
  totals: Array<'small' | 'complement' | null>;
  parts: Array<Array<SplitWithheld | null>>;
}

/**
 * Suppression of a two-level table whose grand total is published: groups (an outcome) of parts
 * (status × exposure group), each group's total shown beside its parts. The group totals are
 * parts of the grand total (marginSuppression); within a group whose total is shown,
 * splitSuppression, which may withhold that total too (as a complement: more unknowns never
 * narrow a small count); a group whose total is withheld shows none of its parts. The grand total
 * is not withheld here: the caller publishes it only where its reader knows it anyway (the rows
 * of a file they uploaded themselves), and a pair such as 4 + 4 = 8 is then theirs already.
 *
 * @example
 * // 2 = 8 − 6 would be narrowed to 1..3 within the first group, which has no other part: it goes whole.
 * nestedSuppression([[6, 2], [9, 0]], 5) // { totals: ['complement', null], parts: [['total', 'total'], [null, null]] }
 */
export function nestedSuppression(groups: number[][], threshold: number): NestedSuppression {
  const top = marginSuppression(
    groups.map((g) => g.reduce((a, b) => a + b, 0)),
    threshold,
  );
  const totals: NestedSuppression['totals'] = [];
  const parts = groups.map((g, i) => {
    if (top.parts[i] !== null) {
      totals.push(top.parts[i] as 'small' | 'complement');
      return g.map((): SplitWithheld => 'total');
    }
    const inner = splitSuppression(g, threshold);
    totals.push(inner.total);
    return inner.parts;
  });
  return { totals, parts };
}
