import { describe, expect, it } from 'vitest';
import { describeRule } from '../describe-rule';

describe('a watch rule as a sentence', () => {
  it('reads an IRR lower-bound rule', () => {
    expect(
      describeRule({
        measure: 'irr',
        thresholdOn: 'lower_bound',
        threshold: 1,
        window: 'rolling12',
        minCases: 3,
        consecutivePeriods: 1,
        fdrControl: true,
        fdrLevel: 0.05,
      }),
    ).toBe(
      'the lower interval bound of the rate ratio against the reference group over rolling 12 months is above 1, with at least 3 cases, false discovery rate held at 0.05',
    );
  });
  it('reads a u-chart rule without a threshold or false discovery control', () => {
    expect(
      describeRule({
        measure: 'uchart',
        thresholdOn: 'estimate',
        threshold: null,
        window: 'month',
        minCases: 1,
        consecutivePeriods: 2,
        fdrControl: true,
        fdrLevel: 0.05,
      }),
    ).toBe('a month is above its u-chart upper limit, with at least 1 case, 2 periods in a row');
  });
});
