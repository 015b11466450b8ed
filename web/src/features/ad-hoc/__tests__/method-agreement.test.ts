import { compareRates, compareRisks } from '@ratewarden/shared/stats';
import { describe, expect, it } from 'vitest';
import { agreementSentence, intervalSpread } from '../method-agreement';

describe('how far the interval methods part', () => {
  it('measures ratios by their relative gap and differences by their absolute gap', () => {
    // By hand: lower limits 1 and 1.1 (10% apart), upper limits equal.
    expect(
      intervalSpread(
        [
          { lower: 1, upper: 2 },
          { lower: 1.1, upper: 2 },
        ],
        'ratio',
      ),
    ).toBeCloseTo(0.1, 12);
    // By hand: upper limits 0.30 and 0.34, 4 points apart; lower limits 1 point apart.
    expect(
      intervalSpread(
        [
          { lower: -0.01, upper: 0.3 },
          { lower: 0, upper: 0.34 },
        ],
        'difference',
      ),
    ).toBeCloseTo(0.04, 12);
    expect(intervalSpread([{ lower: 0.5, upper: 2 }], 'ratio')).toBe(0);
  });

  it('gives no single figure when a method has no finite limit', () => {
    expect(
      intervalSpread(
        [
          { lower: 0.5, upper: Infinity },
          { lower: 0.6, upper: 3 },
        ],
        'ratio',
      ),
    ).toBeNull();
    expect(
      intervalSpread(
        [
          { lower: 0, upper: 3 },
          { lower: 0.6, upper: 3 },
        ],
        'ratio',
      ),
    ).toBeNull();
    expect(
      agreementSentence(
        [
          { lower: null, upper: 3 },
          { lower: 0.6, upper: 3 },
        ],
        'ratio',
        0,
      ),
    ).toMatch(/^With these counts at least one method has no finite limit/);
  });

  it('says large counts agree: 136 and 1,709 cases', () => {
    // Feychting, Osterlund & Ahlbom, Epidemiology 1998;9:490-494 (as printed in the epiR::epi.2by2 help page,
    // example 5): IRR 0.46 (0.38 to 0.55). The Wald limits by hand, exp(ln(0.4607) ± 1.96·√(1/136 + 1/1709)):
    // 0.3869 to 0.5486, within 1% of the exact ones.
    const r = compareRates({ cases: 136, personTime: 22050 }, { cases: 1709, personTime: 127650 });
    const irr = 136 / 22050 / (1709 / 127650);
    const se = Math.sqrt(1 / 136 + 1 / 1709);
    expect(r.irr.wald.lower).toBeCloseTo(irr * Math.exp(-1.959964 * se), 5);
    expect([r.irr.exact.lower!.toFixed(2), r.irr.exact.upper!.toFixed(2)]).toEqual(['0.38', '0.55']);
    const spread = intervalSpread([r.irr.exact, r.irr.midP, r.irr.wald], 'ratio')!;
    expect(spread).toBeLessThan(0.01);
    expect(agreementSentence([r.irr.exact, r.irr.midP, r.irr.wald], 'ratio', 136)).toMatch(
      /^With these counts the methods agree closely: their limits are at most 0\.\d+% apart\.$/,
    );
  });

  it('says small counts part, and which interval to read', () => {
    // 3 versus 2 cases in equal person-time: the exact upper limit of the rate ratio is about 18 (Clopper–Pearson
    // on 3 of 5: upper 0.9473, so 0.9473/0.0527 ≈ 17.96), the Wald one exp(ln 1.5 + 1.96·√(1/3 + 1/2)) ≈ 8.98.
    const r = compareRates({ cases: 3, personTime: 100 }, { cases: 2, personTime: 100 });
    expect(r.irr.exact.upper).toBeCloseTo(17.96, 1);
    expect(r.irr.wald.upper).toBeCloseTo(1.5 * Math.exp(1.959964 * Math.sqrt(1 / 3 + 1 / 2)), 6);
    const sentence = agreementSentence([r.irr.exact, r.irr.midP, r.irr.wald], 'ratio', 2);
    expect(sentence).toMatch(/^With these counts the methods part noticeably: their limits are up to 100% apart\./);
    expect(sentence).toContain(
      'The smallest count here is 2; with fewer than about 10 in a group, read the exact or score intervals rather than the Wald one.',
    );
  });

  it('compares risk-difference methods in percentage points', () => {
    // Newcombe, Stat Med 1998;17:873-890, Table II example (a), 56/70 versus 48/80: method 1 (Wald) 0.0575 to
    // 0.3425, method 10 (hybrid score) 0.0524 to 0.3339; the upper limits are 0.86 points apart.
    const r = compareRisks({ cases: 56, total: 70 }, { cases: 48, total: 80 });
    expect([r.rd.wald.upper!.toFixed(4), r.rd.newcombe.upper!.toFixed(4)]).toEqual(['0.3425', '0.3339']);
    expect(intervalSpread([r.rd.newcombe, r.rd.wald], 'difference')!).toBeCloseTo(0.3425 - 0.3339, 3);
    expect(agreementSentence([r.rd.newcombe, r.rd.wald], 'difference', 14)).toMatch(
      /^With these counts the methods part noticeably: their limits are up to 0\.86\d? percentage points apart\.$/,
    );
  });
});
