import { describe, expect, it } from 'vitest';
import { compareRisks } from './risk-comparison';
import { stratifiedRisks } from './stratified-risks';
import { expectRelClose } from './test-helpers';

const g = (a: number, b: number, c: number, d: number) => ({ exposed: { cases: a, total: a + b }, reference: { cases: c, total: c + d } });
const birthwtRace = [g(19, 33, 4, 40), g(6, 4, 5, 11), g(5, 7, 20, 35)];

describe('Mantel–Haenszel analysis of risks', () => {
  it('birthwt by race: MH OR 3.09 (1.49–6.39), Woolf homogeneity 3.017 without and 2.800 with 0.5 added (epiR::epi.2by2 Example 2)', () => {
    const r = stratifiedRisks(birthwtRace);
    expectRelClose(r.mhOr.estimate, 3.086381253, 1e-8);
    expectRelClose(r.mhOr.p, 0.002154050876, 1e-8); // CMH without correction (R mantelhaen.test(correct = FALSE))
    expectRelClose(r.homogeneityWoolf.chi2, 3.017, 5e-4); // computed, R 4.2.2
    expectRelClose(r.homogeneityWoolfHaldane.chi2, 2.799625945, 1e-8); // epiR prints 2.800
    expect(r.homogeneity.df).toBe(2);
    expect(r.methods.homogeneity).toMatch(/Breslow–Day/);
  });

  it('one stratum: MH RR, RD and OR equal the crude two-group values (Greenland & Robins 1985; common practice)', () => {
    const r = stratifiedRisks([g(56, 14, 48, 32)]);
    const crude = compareRisks({ cases: 56, total: 70 }, { cases: 48, total: 80 });
    expectRelClose(r.mhRr.estimate, crude.rr.estimate as number, 1e-12);
    expectRelClose(r.mhRr.lower, crude.rr.katz.lower as number, 1e-12);
    expectRelClose(r.mhRd.estimate, crude.rd.estimate as number, 1e-12);
    expectRelClose(r.mhOr.estimate, crude.or.estimate as number, 1e-12);
  });

  it('Breslow–Day is 0 when every stratum has the same odds ratio (common practice)', () => {
    const r = stratifiedRisks([g(20, 10, 10, 20), g(40, 20, 20, 40)]);
    expectRelClose(r.mhOr.estimate, 4, 1e-12);
    expect(r.homogeneity.chi2).toBeLessThan(1e-20);
    expectRelClose(r.homogeneity.p, 1, 1e-12);
  });

  it('penicillin and rabbits (Agresti 1990): CMH with continuity correction 3.9286, p 0.047; uninformative strata reported', () => {
    const r = stratifiedRisks([g(0, 6, 0, 5), g(3, 3, 0, 6), g(6, 0, 2, 4), g(5, 1, 6, 0), g(2, 0, 5, 0)]);
    expectRelClose(r.cmhCorrected.chi2, 3.928571429, 1e-8); // R mantelhaen.test help page
    expect(r.mhOr.estimate).toBe(7);
    expect(r.droppedStrata.map((d) => d.index)).toEqual([0, 4]);
    expect(r.homogeneityWoolf.chi2).toBeNull(); // zero cells
  });

  it('all strata without reference events: MH OR Infinity, limits and homogeneity undefined', () => {
    const r = stratifiedRisks([g(3, 3, 0, 6), g(2, 4, 0, 5)]);
    expect(r.mhOr.estimate).toBe(Infinity);
    expect(r.mhOr.lower).toBeNull();
    expect(r.homogeneity.chi2).toBeNull();
    expect(r.reasons.map((x) => x.field)).toEqual(expect.arrayContaining(['mhOr.lower', 'homogeneity']));
  });
});
