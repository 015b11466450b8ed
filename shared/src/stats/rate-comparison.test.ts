import { describe, expect, it } from 'vitest';
import { compareRates } from './rate-comparison';
import { rateRatio } from './rate-ratio';
import { rateDifference } from './rate-difference';
import { expectRelClose } from './test-helpers';

const fluoroExposed = { cases: 41, personTime: 28010 };
const fluoroReference = { cases: 15, personTime: 19017 };

describe('two-group comparison of rates', () => {
  it('fluoroscopy data (Rothman & Greenland 1998 p. 238; values computed with R 4.2.2)', () => {
    const r = compareRates(fluoroExposed, fluoroReference, { per: 10000 });
    expectRelClose(r.irr.estimate, 1.855758658, 1e-8);
    expectRelClose(r.irr.pExact, 0.04766024675, 1e-8); // p_doubled (R 4.2.2)
    expectRelClose(r.irr.pMidP, 0.03545742177, 1e-8); // mid-p (R 4.2.2)
    expectRelClose(r.ird.estimate, 6.749949973, 1e-8); // per 10,000 PY (R 4.2.2)
    // AF_e = (IRR − 1)/IRR; PAF = (a − b T1/T0)/M (Rothman & Greenland 1998)
    expectRelClose(r.afExposed.estimate, (1.855758658 - 1) / 1.855758658, 1e-8);
    expectRelClose(r.excessCases, 41 - (15 * 28010) / 19017, 1e-12);
    expectRelClose(r.afPopulation, (41 - (15 * 28010) / 19017) / 56, 1e-12);
    expect(r.irr.methods.exact).toMatch(/Clopper–Pearson/);
    expect(r.reasons).toEqual([]);
  });

  it('no reference cases: IRR is Infinity, Wald undefined, exact lower finite and upper Infinity', () => {
    const r = rateRatio({ cases: 5, personTime: 1000 }, { cases: 0, personTime: 2000 });
    expect(r.estimate).toBe(Infinity);
    expect(r.wald).toEqual({ lower: null, upper: null });
    expectRelClose(r.exact.lower, 1.832711715, 1e-8); // computed with R 4.2.2 (poisson.test)
    expect(r.exact.upper).toBe(Infinity);
    expect(r.midP.upper).toBe(Infinity);
    expect(r.reasons).toContainEqual({ field: 'wald', reason: 'no cases in the reference group (log of 0)' });
  });

  it('no cases at all: IRR undefined, exact interval 0 to Infinity, p-values 1', () => {
    const r = rateRatio({ cases: 0, personTime: 10 }, { cases: 0, personTime: 20 });
    expect(r.estimate).toBeNull();
    expect(r.exact).toEqual({ lower: 0, upper: Infinity });
    expect(r.pExact).toBe(1);
    expect(r.pScore).toBeNull();
    const d = rateDifference({ cases: 0, personTime: 10 }, { cases: 0, personTime: 20 });
    expect(d.estimate).toBe(0);
    expect(d.wald).toEqual({ lower: null, upper: null });
  });

  it('zero person-time in one group: everything undefined, with reasons; PAF follows', () => {
    const r = compareRates({ cases: 0, personTime: 0 }, { cases: 4, personTime: 100 });
    expect(r.irr.estimate).toBeNull();
    expect(r.ird.estimate).toBeNull();
    expect(r.afPopulation).toBeNull();
    expect(r.reasons.some((x) => x.field === 'irr.estimate' && /exposed/.test(x.reason))).toBe(true);
  });

  it('IRR of 0 gives an AF among the exposed of −Infinity, explicitly', () => {
    const r = compareRates({ cases: 0, personTime: 1000 }, { cases: 5, personTime: 2000 });
    expect(r.irr.estimate).toBe(0);
    expect(r.afExposed.estimate).toBe(-Infinity);
    expect(r.afPopulation).toBe(-0.5); // (0 − 5·1000/2000)/5
  });

  it('Wald, exact and mid-p agree to about 3 s.f. for large counts (Breslow & Day 1987; common practice)', () => {
    const r = rateRatio({ cases: 4000, personTime: 1e6 }, { cases: 2000, personTime: 1e6 });
    expectRelClose(r.wald.lower, r.exact.lower as number, 1e-3);
    expectRelClose(r.midP.upper, r.exact.upper as number, 1e-3);
  });
});
