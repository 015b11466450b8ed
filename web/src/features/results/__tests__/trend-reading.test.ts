import { describe, expect, it } from 'vitest';
import { rateTrend } from '@ratewarden/shared/stats/rate-trend';
import { trendReading } from '../trend-reading';

const levels = (...rates: Array<number | null>) => rates.map((rate, i) => ({ label: `level ${i}`, rate }));

describe('the words beside the score test for trend', () => {
  it('says what the test tests, and does not call an uneven rise steady (rates 25.9, 12.3, 16.3, 85.9)', () => {
    const text = trendReading({ u: 40, p: 0.0004, alpha: 0.05, levels: levels(25.9, 12.3, 16.3, 85.9) });
    expect(text).toBe(
      'The score test finds a linear trend in the rates across the level scores, upward, but the rates do not rise at every level: they fall from level 0 to level 1.',
    );
    expect(text).not.toMatch(/rates rise with/);
  });

  it('says a rise is steady only when every level is above the one before', () => {
    expect(trendReading({ u: 5, p: 0.01, alpha: 0.05, levels: levels(1, 2, 3) })).toBe(
      'The score test finds a linear trend in the rates across the level scores, upward, and the rates rise at every level.',
    );
    expect(trendReading({ u: 5, p: 0.01, alpha: 0.05, levels: levels(1, 1, 3) })).toBe(
      'The score test finds a linear trend in the rates across the level scores, upward, and the rates never fall from one level to the next.',
    );
  });

  it('reads a downward trend the same way, naming every step against it', () => {
    expect(trendReading({ u: -3, p: 0.02, alpha: 0.05, levels: levels(9, 10, 4, 6, 1) })).toBe(
      'The score test finds a linear trend in the rates across the level scores, downward, but the rates do not fall at every level: they rise from level 0 to level 1 and from level 2 to level 3.',
    );
  });

  it('leaves out a level without person-time when it looks at the steps', () => {
    expect(trendReading({ u: 2, p: 0.03, alpha: 0.05, levels: levels(1, null, 3) })).toContain('the rates rise at every level');
  });

  it('claims no trend and no direction when p is not below the level', () => {
    expect(trendReading({ u: 5, p: 0.0679, alpha: 0.05, levels: levels(10, 20) })).toBe(
      'The score test finds no clear linear trend in the rates across the level scores (at the 5% level); the level rates are in the table.',
    );
    expect(trendReading({ u: 5, p: 0.0679, alpha: 0.1, levels: levels(10, 20) })).toContain('finds a linear trend');
  });

  it('says so when the test is not defined', () => {
    expect(trendReading({ u: null, p: null, alpha: 0.05, levels: levels(0, 0) })).toMatch(
      /^The score test for a linear trend in the rates across the level scores is not defined here/,
    );
  });

  it('reads the statistics core’s own test of the uneven rates: significant and upward, yet not steady', () => {
    // Cases and person-time per level chosen to give the rates 25.9, 12.3, 16.3 and 85.9 per 1,000 (by hand: 259 / 10,000 person-years × 1,000 = 25.9, and so on).
    const t = rateTrend(
      [
        { score: 0, cases: 259, personTime: 10_000 },
        { score: 1, cases: 123, personTime: 10_000 },
        { score: 2, cases: 163, personTime: 10_000 },
        { score: 3, cases: 859, personTime: 10_000 },
      ],
      { confidence: 0.95, per: 1000 },
    );
    // Hand computation (Breslow & Day's score statistic, as in rate-trend.ts): O₊ = 1404, E = 351 each, U = Σx(O − E) = 1·(−228) + 2·(−188) + 3·508 = 920 > 0.
    expect(t.u).toBeCloseTo(920, 6);
    expect(t.p!).toBeLessThan(0.001);
    const text = trendReading({ u: t.u, p: t.p, alpha: 0.05, levels: t.levels.map((l) => ({ label: `level ${l.score}`, rate: l.rate.estimate })) });
    expect(text).toContain('but the rates do not rise at every level: they fall from level 0 to level 1');
  });
});
