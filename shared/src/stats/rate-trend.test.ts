import { describe, expect, it } from 'vitest';
import { rateRatio } from './rate-ratio';
import { rateTrend } from './rate-trend';
import { expectRelClose } from './test-helpers';
import { StatsValidationError } from './validation';

describe('score test for trend in rates', () => {
  it('with two levels scored 0/1 it is the conditional score test of IRR = 1 (Breslow & Day 1987)', () => {
    const levels = [
      { score: 0, cases: 15, personTime: 19017 },
      { score: 1, cases: 41, personTime: 28010 },
    ];
    const t = rateTrend(levels);
    const r = rateRatio(levels[1]!, levels[0]!);
    expectRelClose(t.p, r.pScore as number, 1e-12);
    expect(t.u).toBeGreaterThan(0);
  });

  it('hand-computed three-level example (common practice: the formula worked by hand)', () => {
    // O = 10, 20, 30 in T = 1000 each: E = 20 each; U = Σx(O − E) = 0·(−10) + 1·0 + 2·10 = 20;
    // V = Σx²E − (ΣxE)²/O₊ = 100 − 60²/60 = 40; χ² = 400/40 = 10.
    const t = rateTrend(
      [
        { score: 0, cases: 10, personTime: 1000 },
        { score: 1, cases: 20, personTime: 1000 },
        { score: 2, cases: 30, personTime: 1000 },
      ],
      { per: 1000 },
    );
    expectRelClose(t.chi2, 10, 1e-12);
    expect(t.df).toBe(1);
    expect(t.levels[2]!.rate.estimate).toBe(30);
  });

  it('equal rates give 0 (p = 1); levels without person-time are removed and reported', () => {
    const t = rateTrend([
      { score: 0, cases: 5, personTime: 100 },
      { score: 1, cases: 10, personTime: 200 },
      { score: 2, cases: 0, personTime: 0 },
    ]);
    expect(t.chi2).toBe(0);
    expect(t.p).toBe(1);
    expect(t.droppedLevels).toEqual([{ index: 2, reason: 'no person-time' }]);
  });

  it('no cases or equal scores: undefined with reasons; fewer than two levels is invalid', () => {
    expect(
      rateTrend([
        { score: 0, cases: 0, personTime: 5 },
        { score: 1, cases: 0, personTime: 5 },
      ]).chi2,
    ).toBeNull();
    expect(
      rateTrend([
        { score: 1, cases: 2, personTime: 5 },
        { score: 1, cases: 3, personTime: 5 },
      ]).reasons[0]!.reason,
    ).toMatch(/same score/);
    expect(() => rateTrend([{ score: 0, cases: 1, personTime: 1 }])).toThrow(StatsValidationError);
  });
});
