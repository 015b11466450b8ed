/**
 * The words beside a score test for trend. The test (shared/src/stats/rate-trend.ts) asks one
 * question: is there a linear trend in the rates across the level scores? A small p says the
 * rates lean one way along the scores, not that each level is above the one before: one high
 * level can carry the test while the others go up and down. So the reading says what was tested,
 * and says a rise (or fall) is steady only when every level's rate agrees.
 */
export interface TrendReadingInput {
  /** Signed score statistic Σ xⱼ(Oⱼ − Eⱼ): positive when rates rise with the score; null when not defined. */
  u: number | null;
  p: number | null;
  /** The test's significance level: 1 − the run's confidence level. */
  alpha: number;
  /** The levels in score order, with their rates (null: no person-time, left out of the test). */
  levels: Array<{ label: string; rate: number | null }>;
}

const TESTED = 'a linear trend in the rates across the level scores';

/** Level-to-level steps against the test's direction ("from level 0 to level 1"), and whether some step is flat. */
function steps(levels: TrendReadingInput['levels'], rising: boolean): { against: string[]; flat: boolean } {
  const known = levels.filter((l): l is { label: string; rate: number } => l.rate !== null && Number.isFinite(l.rate));
  const against: string[] = [];
  let flat = false;
  for (let i = 1; i < known.length; i++) {
    const a = known[i - 1]!;
    const b = known[i]!;
    if (rising ? b.rate < a.rate : b.rate > a.rate) against.push(`from ${a.label} to ${b.label}`);
    flat ||= b.rate === a.rate;
  }
  return { against, flat };
}

/**
 * @example
 * trendReading({ u: 12, p: 0.001, alpha: 0.05, levels: [{ label: 'level 0', rate: 25.9 }, { label: 'level 1', rate: 12.3 }, { label: 'level 2', rate: 16.3 }, { label: 'level 3', rate: 85.9 }] })
 * // 'The score test finds a linear trend in the rates across the level scores, upward, but the rates do not rise at every level: they fall from level 0 to level 1.'
 */
export function trendReading({ u, p, alpha, levels }: TrendReadingInput): string {
  if (u === null || p === null) return `The score test for ${TESTED} is not defined here (no cases, or fewer than two levels with person-time).`;
  if (p >= alpha)
    return `The score test finds no clear linear trend in the rates across the level scores (at the ${formatLevel(alpha)} level); the level rates are in the table.`;
  if (u === 0) return `The score test finds ${TESTED}, without a direction.`;
  const rising = u > 0;
  const { against, flat } = steps(levels, rising);
  const found = `The score test finds ${TESTED}, ${rising ? 'upward' : 'downward'}`;
  if (against.length === 0) {
    return flat
      ? `${found}, and the rates never ${rising ? 'fall' : 'rise'} from one level to the next.`
      : `${found}, and the rates ${rising ? 'rise' : 'fall'} at every level.`;
  }
  return `${found}, but the rates do not ${rising ? 'rise' : 'fall'} at every level: they ${rising ? 'fall' : 'rise'} ${joinWords(against)}.`;
}

const formatLevel = (alpha: number) => `${Number((alpha * 100).toPrecision(3))}%`;

function joinWords(parts: string[]): string {
  return parts.length <= 1 ? (parts[0] ?? '') : `${parts.slice(0, -1).join(', ')} and ${parts.at(-1)}`;
}
