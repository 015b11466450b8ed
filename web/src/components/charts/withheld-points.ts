/**
 * Which periods of a trend chart have figures withheld from the reader, and how to say so. The
 * chart marks each such period once on its axis (not once per group, which stacks markers), and
 * the words under it name them, or count them when there are too many to read as a list.
 */
export interface WithheldPeriod {
  period: string;
  groups: string[];
}

export function withheldPeriods(periods: string[], series: Array<{ name: string; points: Array<{ period: string; withheld?: boolean }> }>): WithheldPeriod[] {
  return periods
    .map((period) => ({ period, groups: series.filter((s) => s.points.some((p) => p.period === period && p.withheld)).map((s) => s.name) }))
    .filter((w) => w.groups.length > 0);
}

/** At most this many periods are listed by name; beyond it the words count them. */
export const LISTED_PERIODS = 6;

export function withheldWords(withheld: WithheldPeriod[], periodCount: number): string {
  if (withheld.length > LISTED_PERIODS) return `${withheld.length} of the ${periodCount} periods shown (the table lists each)`;
  return withheld.map((w) => `${w.period} (${w.groups.join(', ')})`).join('; ');
}
