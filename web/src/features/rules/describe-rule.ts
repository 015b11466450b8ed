import type { WatchRule } from '@ratewarden/shared/rules';

/** A rule as one sentence, for lists and for the editor's preview. */
const measures = {
  irr: 'the rate ratio against the reference group',
  ird: 'the rate difference against the reference group',
  rate: 'the rate',
  uchart: 'a month is above its u-chart upper limit',
  sir: 'the SIR against the reference rates',
} as const;

export function describeRule(
  r: Pick<WatchRule, 'measure' | 'thresholdOn' | 'threshold' | 'window' | 'minCases' | 'consecutivePeriods' | 'fdrControl' | 'fdrLevel'>,
): string {
  const win = r.window === 'rolling12' ? 'over rolling 12 months' : 'in a single month';
  const head =
    r.measure === 'uchart'
      ? measures.uchart
      : `${r.thresholdOn === 'lower_bound' ? 'the lower interval bound of ' : ''}${measures[r.measure]} ${win} is above ${r.threshold ?? '—'}`;
  const extra = [
    `at least ${r.minCases} case${r.minCases === 1 ? '' : 's'}`,
    r.consecutivePeriods > 1 ? `${r.consecutivePeriods} periods in a row` : null,
    r.fdrControl && r.measure !== 'uchart' ? `false discovery rate held at ${r.fdrLevel}` : null,
  ].filter(Boolean);
  return `${head}, with ${extra.join(', ')}`;
}
