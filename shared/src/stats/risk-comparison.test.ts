import { describe, expect, it } from 'vitest';
import { fisherExactP, pearsonChiSquare } from './contingency-tests';
import { numberNeeded } from './number-needed';
import { compareRisks } from './risk-comparison';
import { riskRatio } from './risk-ratio';
import { wilsonInterval } from './proportion-intervals';
import { expectRelClose } from './test-helpers';
import { StatsValidationError } from './validation';

describe('2×2 comparison of risks', () => {
  it('Newcombe example (a): RD, RR, OR, tests and NNT (Newcombe 1998 Table II; values computed with R 4.2.2 / scipy 1.10)', () => {
    const r = compareRisks({ cases: 56, total: 70 }, { cases: 48, total: 80 });
    expectRelClose(r.rd.estimate, 0.2, 1e-12);
    expectRelClose(r.rd.newcombe.lower, 0.0524314724, 1e-8); // Newcombe 1998 Table II, method 10: 0.0524
    expectRelClose(r.rr.katz.upper, 1.651248511, 1e-8); // computed, R 4.2.2
    expectRelClose(r.or.exact.estimate, 2.649187296, 1e-8); // conditional MLE, computed (scipy odds_ratio agrees)
    expectRelClose(r.pFisher, 0.01252112975, 1e-8); // R fisher.test
    expectRelClose(r.pChiSquare, 0.008045081368196585, 1e-9); // scipy chi2_contingency(correction=False)
    expectRelClose(r.pChiSquareYates, 0.013409475178668966, 1e-9); // scipy chi2_contingency(correction=True)
    expect(r.nnt.estimate).toBeCloseTo(5, 12);
    expect(r.nnt.direction).toBe('harm');
    expect(r.methods.nnt).toMatch(/Altman/);
  });

  it('zero cells: RR Infinity with Katz undefined, exact OR (0.4833, Infinity), Newcombe RD still defined', () => {
    const r = compareRisks({ cases: 5, total: 56 }, { cases: 0, total: 29 });
    expect(r.rr.estimate).toBe(Infinity);
    expect(r.rr.katz).toEqual({ lower: null, upper: null });
    expect(r.or.woolf).toEqual({ lower: null, upper: null });
    expectRelClose(r.or.exact.lower, 0.4833, 1e-3); // Cornfield exact limit; computed to 1e-12 in R 4.2.2
    expect(r.or.exact.upper).toBe(Infinity);
    expectRelClose(r.rd.newcombe.lower, -0.0381371479, 1e-8); // Newcombe 1998 Table II (d): −0.0381
    expect(r.nnt.throughInfinity).toBe(true);
    expect(r.reasons.map((x) => x.field)).toContain('rr.katz');
  });

  it('no events at all: RR and OR undefined, tests undefined with reasons, Fisher p = 1', () => {
    const r = compareRisks({ cases: 0, total: 10 }, { cases: 0, total: 20 });
    expect(r.rr.estimate).toBeNull();
    expect(r.or.estimate).toBeNull();
    expect(r.or.exact.estimate).toBeNull();
    expect(r.pChiSquare).toBeNull();
    expect(r.pFisher).toBe(1);
    expect(r.nnt.estimate).toBeNull();
    expect(r.reasons.map((x) => x.field)).toEqual(expect.arrayContaining(['pChiSquare', 'nnt.estimate']));
  });

  it('an empty group is degenerate, cases above total are invalid', () => {
    const r = compareRisks({ cases: 0, total: 0 }, { cases: 3, total: 10 });
    expect(r.rd.estimate).toBeNull();
    expect(r.riskExposed).toBeNull();
    expect(() => compareRisks({ cases: 4, total: 3 }, { cases: 0, total: 1 })).toThrow(StatsValidationError);
  });

  it('Yates correction never overshoots: |ad − bc| < N/2 gives χ² = 0 (R chisq.test / scipy convention; from memory)', () => {
    expect(pearsonChiSquare({ a: 5, b: 5, c: 5, d: 6 }, true).chi2).toBe(0);
  });

  it('Fisher exact two-sided p for 3/10 vs 9/10 is symmetric in the tables (minimum-likelihood rule)', () => {
    expectRelClose(fisherExactP({ a: 9, b: 1, c: 3, d: 7 }), fisherExactP({ a: 3, b: 7, c: 9, d: 1 }), 1e-14);
  });

  it('Wilson limits pin 0 and 1 at the ends', () => {
    expect(wilsonInterval(0, 10, 0.95).lower).toBe(0);
    expect(wilsonInterval(10, 10, 0.95).upper).toBe(1);
  });

  it('NNT: benefit direction and an RD limit at exactly 0', () => {
    const benefit = numberNeeded(-0.25, { lower: -0.4, upper: -0.1 });
    expect(benefit.direction).toBe('benefit');
    expectRelClose(benefit.lower, -10, 1e-12); // 1/RD_U (Altman 1998)
    expectRelClose(benefit.upper, -2.5, 1e-12); // 1/RD_L
    expect(numberNeeded(0.2, { lower: 0, upper: 0.4 }).upper).toBe(-Infinity);
  });

  it('RR of 0 when the exposed have no events', () => {
    expect(riskRatio({ a: 0, b: 10, c: 2, d: 8 }).estimate).toBe(0);
  });
});
