import { describe, expect, it } from 'vitest';
import { memoLimits } from './memo';
import { poissonExactLimits, poissonMidPLimits } from './poisson-limits';
import { binomialMidPOddsLimits, clopperPearsonOddsLimits } from './rate-ratio';
import { expectRelClose } from './test-helpers';

describe('memoised limits', () => {
  it('computes once per arguments and hands out copies', () => {
    let calls = 0;
    const f = memoLimits((x: number, c: number) => {
      calls++;
      return { lower: x * c, upper: x + c };
    });
    const a = f(3, 0.5);
    a.lower = -1;
    expect(f(3, 0.5)).toEqual({ lower: 1.5, upper: 3.5 });
    expect(f(4, 0.5)).toEqual({ lower: 2, upper: 4.5 });
    expect(calls).toBe(2);
  });

  it('stays bounded: emptied when full, then recomputes', () => {
    let calls = 0;
    const f = memoLimits((x: number) => ({ lower: x, upper: (calls++, x) }), 2);
    f(1);
    f(2);
    f(3); // full: emptied, then 3 stored
    f(1);
    expect(calls).toBe(4);
  });

  it('the memoised limits give the published values on first and repeated calls', () => {
    for (let i = 0; i < 2; i++) {
      // Garwood limits for x = 10: 4.7954 and 18.3904 (tables of exact Poisson limits, e.g. Breslow & Day 1987 Vol II; from memory)
      expectRelClose(poissonExactLimits(10, 0.95).lower, 4.795388696132435, 1e-12);
      expectRelClose(poissonExactLimits(10, 0.95).upper, 18.39035604201778, 1e-12);
      // mid-p upper for x = 0 is −ln 0.05 (closed form: P(X = 0)/2 = 0.025 ⇔ e^{−μ} = 0.05)
      expectRelClose(poissonMidPLimits(0, 0.95).upper, -Math.log(0.05), 1e-9);
      // Clopper–Pearson upper for 0 of 5 is 1 − 0.025^{1/5} (closed form), as odds
      const piU = 1 - 0.025 ** (1 / 5);
      expectRelClose(clopperPearsonOddsLimits(0, 5, 0.95).upper, piU / (1 - piU), 1e-10);
      // mid-p for 1 of 2: π_L solves π²/2 + π(1 − π) = 0.025 ... symmetric, so lower odds = 1/upper odds
      const m = binomialMidPOddsLimits(1, 2, 0.95);
      expectRelClose(m.lower * m.upper, 1, 1e-9);
    }
  });
});
