import { describe, expect, it } from 'vitest';
import { compareRates } from './rate-comparison';
import { mantelHaenszelRates, stratifiedRates } from './stratified-rates';
import { expectRelClose } from './test-helpers';

// British doctors, coronary deaths, smokers vs non-smokers by age band (Doll & Hill; worked in
// Rothman & Greenland 1998 and Breslow & Day 1987 Vol II; inputs from memory).
const britishDoctors = [
  [32, 52407, 2, 18790],
  [104, 43248, 12, 10673],
  [206, 28612, 28, 5710],
  [186, 12663, 28, 2585],
  [102, 5317, 31, 1462],
].map(([a, t1, b, t0]) => ({ exposed: { cases: a!, personTime: t1! }, reference: { cases: b!, personTime: t0! } }));

describe('Mantel–Haenszel analysis of rates', () => {
  it('British doctors: MH χ² 11.016 and score homogeneity 11.15 on 4 df (computed with R 4.2.2 and scipy 1.10)', () => {
    const r = stratifiedRates(britishDoctors);
    expectRelClose(r.mhIrr.chi2, 11.016, 1e-4);
    expectRelClose(r.homogeneity.chi2, 11.15, 5e-4);
    expect(r.homogeneity.df).toBe(4);
    expect(r.homogeneity.p).toBeLessThan(0.05);
    expect(r.crude.irr.estimate).toBeGreaterThan(r.mhIrr.estimate as number); // age confounds the crude ratio
    expect(r.methods.mhIrr).toMatch(/Greenland–Robins/);
  });

  it('mantelHaenszelRates is stratifiedRates without the crude comparison (British doctors, as above)', () => {
    const { crude, reasons, ...adjusted } = stratifiedRates(britishDoctors);
    const alone = mantelHaenszelRates(britishDoctors);
    expect({ ...alone, reasons: [] }).toEqual({ ...adjusted, reasons: [] });
    expect(reasons).toEqual([...crude.reasons.map((r) => ({ ...r, field: `crude.${r.field}` })), ...alone.reasons]);
    expectRelClose(alone.mhIrr.chi2, 11.016, 1e-4); // R 4.2.2 and scipy 1.10, as above
  });

  it('one stratum: MH equals crude (Greenland & Robins 1985 reduce to the two-group formulas)', () => {
    const s = { exposed: { cases: 41, personTime: 28010 }, reference: { cases: 15, personTime: 19017 } };
    const r = stratifiedRates([s]);
    const crude = compareRates(s.exposed, s.reference);
    expectRelClose(r.mhIrr.estimate, crude.irr.estimate as number, 1e-12);
    expectRelClose(r.mhIrr.lower, crude.irr.wald.lower as number, 1e-12);
    expectRelClose(r.mhIrd.estimate, crude.ird.estimate as number, 1e-12);
    expectRelClose(r.mhIrd.upper, crude.ird.wald.upper as number, 1e-12);
    expect(r.homogeneity).toEqual({ chi2: null, df: null, p: null });
  });

  it('drops strata without person-time in an arm and strata without cases, and reports them', () => {
    const r = stratifiedRates([
      ...britishDoctors,
      { exposed: { cases: 0, personTime: 0 }, reference: { cases: 3, personTime: 100 } },
      { exposed: { cases: 0, personTime: 50 }, reference: { cases: 0, personTime: 100 } },
    ]);
    expect(r.droppedStrata.map((d) => d.index)).toEqual([5, 6]);
    expect(r.droppedStrata[0]!.reason).toBe('no person-time in the exposed arm');
    expect(r.droppedStrata[1]!.excludedFrom).toEqual(['mhIrr', 'homogeneity']);
    expect(r.strataUsed).toEqual({ irr: 5, ird: 6 });
    expectRelClose(r.mhIrr.chi2, 11.016, 1e-4); // unchanged by the uninformative strata
    expect(r.homogeneity.df).toBe(4);
  });

  it('a zero count in one arm still contributes; no reference cases anywhere gives Infinity', () => {
    const r = stratifiedRates([
      { exposed: { cases: 3, personTime: 100 }, reference: { cases: 0, personTime: 100 } },
      { exposed: { cases: 2, personTime: 100 }, reference: { cases: 0, personTime: 50 } },
    ]);
    expect(r.mhIrr.estimate).toBe(Infinity);
    expect(r.mhIrr.lower).toBeNull();
    expect(r.homogeneity.chi2).toBeNull();
    expect(r.reasons.map((x) => x.field)).toContain('homogeneity.chi2');
  });

  it('no usable stratum: everything undefined with reasons', () => {
    const r = stratifiedRates([{ exposed: { cases: 0, personTime: 0 }, reference: { cases: 0, personTime: 10 } }]);
    expect(r.mhIrr.estimate).toBeNull();
    expect(r.mhIrd.estimate).toBeNull();
    expect(r.reasons.length).toBeGreaterThan(3);
  });
});
