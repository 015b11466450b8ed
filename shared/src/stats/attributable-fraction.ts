/**
 * The attributable fraction of a ratio measure R (rate ratio or risk ratio),
 * AF = (R − 1)/R (Rothman & Greenland 1998, ch. 4). It is negative when
 * R < 1; R = ∞ gives 1 and R = 0 gives −∞ (explicitly infinite, not a large number).
 *
 * @example
 * attributableFractionOf(4) // 0.75
 */
export function attributableFractionOf(ratio: number | null): number | null {
  if (ratio === null) return null;
  if (ratio === Infinity) return 1;
  if (ratio === 0) return -Infinity;
  return (ratio - 1) / ratio; // AF = (R − 1)/R
}
