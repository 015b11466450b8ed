import { formatEstimate, formatPercent } from '../../lib/format';

/**
 * How far the interval methods of one comparison part from each other with the counts at hand, and
 * the standing notes on why they part at all. The fold of other methods shows both under its table.
 */
export interface MethodInterval {
  lower: number | null;
  upper: number | null;
}

/** Counts below this in any group make the approximate intervals the first to go astray. */
export const smallCountBelow = 10;

/** Ratios are compared on the log scale (a relative gap), differences by their absolute gap. */
export type IntervalScale = 'ratio' | 'difference';

const usable = (x: number | null, scale: IntervalScale): x is number => x !== null && Number.isFinite(x) && (scale === 'difference' || x > 0);

/**
 * The widest gap between the methods' lower limits or between their upper limits: for ratios the
 * relative gap (0.1 = one limit 10% above the other), for differences the absolute one. Null when
 * some method has no finite limit, so no single figure can say how far they part.
 */
export function intervalSpread(intervals: MethodInterval[], scale: IntervalScale): number | null {
  if (intervals.length < 2) return 0;
  const limits = [intervals.map((i) => i.lower), intervals.map((i) => i.upper)];
  let widest = 0;
  for (const side of limits) {
    if (!side.every((x) => usable(x, scale))) return null;
    const values = (side as number[]).map((x) => (scale === 'ratio' ? Math.log(x) : x));
    widest = Math.max(widest, Math.max(...values) - Math.min(...values));
  }
  return scale === 'ratio' ? Math.expm1(widest) : widest;
}

/** Below these gaps the methods are said to agree: 5% relative for ratios, half a percentage point for risk differences. */
const closeEnough: Record<IntervalScale, number> = { ratio: 0.05, difference: 0.005 };

/** One sentence on how the methods compare for these counts; `fewestCases` is the smallest count that enters them. */
export function agreementSentence(intervals: MethodInterval[], scale: IntervalScale, fewestCases: number): string {
  const spread = intervalSpread(intervals, scale);
  const small =
    fewestCases < smallCountBelow
      ? ` The smallest count here is ${fewestCases}; with fewer than about ${smallCountBelow} in a group, read the exact or score intervals rather than the Wald one.`
      : '';
  if (spread === null) return `With these counts at least one method has no finite limit, so compare the rows one by one.${small}`;
  const gap = scale === 'ratio' ? formatPercent(spread) : `${formatEstimate(spread * 100)} percentage points`;
  if (spread < closeEnough[scale]) return `With these counts the methods agree closely: their limits are at most ${gap} apart.${small}`;
  return `With these counts the methods part noticeably: their limits are up to ${gap} apart.${small}`;
}

/** Why rate-ratio intervals differ, in general. */
export const ratioMethodsNote =
  'All three intervals answer the same question by different arithmetic. The exact and mid-p intervals work from the case counts themselves; the Wald interval treats the logarithm of the ratio as if it spread like a bell curve, which holds only when both groups have plenty of cases. With few cases they part: the exact interval is the widest, erring towards caution, the mid-p one a little narrower, and the Wald one can be too narrow. With many cases they agree to the digits shown.';

/** Why risk-difference intervals differ, in general. */
export const differenceMethodsNote =
  'The four intervals differ in how they allow for risks near 0% or 100% and for small groups. The score intervals (Newcombe, Miettinen–Nurminen, Mee) stay inside the possible range and keep close to their stated confidence even with few people; the Wald interval adds and subtracts a fixed margin, which can run past 0% or 100% and is too narrow when a cell is small. With large groups and risks away from the extremes they agree.';

/** Why the tests of a 2×2 table differ, in general. */
export const tableTestsNote =
  'The tests ask one question, whether the risks are equal. Fisher’s test counts every table with the same margins; the chi-square tests approximate that count and are trustworthy when every cell has about 5 or more; the continuity correction moves the chi-square towards the exact answer and is often conservative.';
