/**
 * Property tests (fast-check) of the core: intervals contain the estimate, are narrower at a
 * lower confidence, the IRR of swapped groups is the reciprocal with swapped limits, MH over
 * one stratum equals the crude result, and results do not depend on the person-time unit.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { incidenceRate } from './incidence-rate';
import { oddsRatio } from './odds-ratio';
import { compareRates } from './rate-comparison';
import { rateRatio } from './rate-ratio';
import { riskDifference } from './risk-difference';
import { stratifiedRates } from './stratified-rates';
import { expectRelClose } from './test-helpers';

const count = fc.oneof(fc.integer({ min: 0, max: 12 }), fc.integer({ min: 0, max: 3000 }));
const personTime = fc.double({ min: 0.5, max: 1e6, noNaN: true });
const group = fc.record({ cases: count, personTime });
const confidence = fc.constantFrom(0.8, 0.9, 0.95, 0.99);
const REL = 1e-8;

const contains = (lower: number | null, upper: number | null, x: number | null) => {
  if (lower === null || upper === null || x === null) return;
  // Relative 1e-12 slack for rounding (x may be negative: a risk difference).
  const slack = Number.isFinite(x) ? 1e-12 * Math.abs(x) + 1e-15 : 0;
  expect(lower).toBeLessThanOrEqual(x + slack);
  expect(upper).toBeGreaterThanOrEqual(x - slack);
};

describe('properties of the statistics core', () => {
  it('intervals contain the estimate (rates, IRR, IRD, RD, OR)', () => {
    fc.assert(
      fc.property(group, group, confidence, (e, r, c) => {
        const res = compareRates(e, r, { confidence: c });
        const rate = res.rateExposed;
        contains(rate.exact.lower, rate.exact.upper, rate.estimate);
        contains(rate.midP.lower, rate.midP.upper, rate.estimate);
        for (const i of [res.irr.wald, res.irr.exact, res.irr.midP]) contains(i.lower, i.upper, res.irr.estimate);
        contains(res.ird.wald.lower, res.ird.wald.upper, res.ird.estimate);
      }),
      { numRuns: 150 },
    );
    const table = fc.record({
      a: fc.integer({ min: 0, max: 60 }),
      b: fc.integer({ min: 0, max: 60 }),
      c: fc.integer({ min: 0, max: 60 }),
      d: fc.integer({ min: 0, max: 60 }),
    });
    fc.assert(
      fc.property(table, confidence, (t, c) => {
        if (t.a + t.b === 0 || t.c + t.d === 0) return;
        const rd = riskDifference(t, c);
        contains(rd.newcombe.lower, rd.newcombe.upper, rd.estimate);
        contains(rd.miettinenNurminen.lower, rd.miettinenNurminen.upper, rd.estimate);
        const or = oddsRatio(t, c);
        contains(or.exact.lower, or.exact.upper, or.exact.estimate);
        contains(or.woolf.lower, or.woolf.upper, or.estimate);
      }),
      { numRuns: 150 },
    );
  });

  it('intervals are narrower at a lower confidence', () => {
    fc.assert(
      fc.property(group, group, (e, r) => {
        const lo = rateRatio(e, r, 0.9);
        const hi = rateRatio(e, r, 0.95);
        for (const k of ['exact', 'midP'] as const) {
          if (lo[k].lower === null || hi[k].lower === null) continue;
          expect(lo[k].lower).toBeGreaterThanOrEqual((hi[k].lower as number) * (1 - 1e-12));
          expect(lo[k].upper).toBeLessThanOrEqual((hi[k].upper as number) * (1 + 1e-12));
        }
        const r90 = incidenceRate(e, { confidence: 0.9 }).exact;
        const r95 = incidenceRate(e, { confidence: 0.95 }).exact;
        expect(r90.upper).toBeLessThan(r95.upper as number);
      }),
      { numRuns: 150 },
    );
  });

  it('the IRR of swapped groups is the reciprocal, with swapped limits', () => {
    fc.assert(
      fc.property(group, group, confidence, (e, r, c) => {
        if (e.cases + r.cases === 0) return;
        const fwd = rateRatio(e, r, c);
        const back = rateRatio(r, e, c);
        const inv = (x: number | null) => (x === null ? null : x === 0 ? Infinity : x === Infinity ? 0 : 1 / x);
        const check = (actual: number | null, expected: number | null) => {
          if (expected === null || expected === Infinity || expected === 0) return expect(actual).toBe(expected);
          expectRelClose(actual, expected, REL);
        };
        check(back.estimate, inv(fwd.estimate));
        for (const k of ['wald', 'exact', 'midP'] as const) {
          check(back[k].lower, inv(fwd[k].upper));
          check(back[k].upper, inv(fwd[k].lower));
        }
        expectRelClose(back.pExact, fwd.pExact as number, REL);
      }),
      { numRuns: 150 },
    );
  });

  it('MH over one stratum equals the crude comparison', () => {
    fc.assert(
      fc.property(group, group, confidence, (e, r, c) => {
        if (e.cases + r.cases === 0) return;
        const mh = stratifiedRates([{ exposed: e, reference: r }], { confidence: c });
        const crude = compareRates(e, r, { confidence: c });
        if (crude.irr.estimate === Infinity) expect(mh.mhIrr.estimate).toBe(Infinity);
        else expectRelClose(mh.mhIrr.estimate, crude.irr.estimate as number, 1e-10);
        if (crude.irr.wald.lower !== null) expectRelClose(mh.mhIrr.lower, crude.irr.wald.lower, 1e-10);
        expectRelClose(mh.mhIrr.p, crude.irr.pScore as number, 1e-9); // the MH χ² with one stratum is the score test
        // The rate difference cancels when the rates are close: compare it on the scale of the rates.
        const rateScale = Math.max(crude.rateExposed.estimate ?? 0, crude.rateReference.estimate ?? 0);
        expectRelClose(mh.mhIrd.estimate, crude.ird.estimate as number, 1e-10, 1e-12 * rateScale + 1e-15);
      }),
      { numRuns: 150 },
    );
  });

  it('results do not depend on the person-time unit (hours vs years, with `per` scaled alike)', () => {
    fc.assert(
      fc.property(group, group, fc.constantFrom(12, 365.25, 2000, 1 / 200_000), (e, r, k) => {
        const base = compareRates(e, r, { per: 1000 });
        const scaled = compareRates({ cases: e.cases, personTime: e.personTime * k }, { cases: r.cases, personTime: r.personTime * k }, { per: 1000 * k });
        const same = (x: number | null, y: number | null, abs = 1e-15) =>
          x === null || !Number.isFinite(x) ? expect(y).toBe(x) : expectRelClose(y, x, 1e-9, abs);
        same(base.irr.estimate, scaled.irr.estimate);
        same(base.irr.exact.lower, scaled.irr.exact.lower);
        same(base.irr.midP.upper, scaled.irr.midP.upper);
        same(base.rateExposed.estimate, scaled.rateExposed.estimate);
        // A difference of two rates cancels: compare it on the scale of the rates it came from.
        const rateScale = Math.max(base.rateExposed.estimate ?? 0, base.rateReference.estimate ?? 0);
        same(base.ird.estimate, scaled.ird.estimate, 1e-12 * rateScale + 1e-15);
        same(base.ird.wald.upper, scaled.ird.wald.upper, 1e-12 * rateScale + 1e-15);
        same(base.irr.pExact, scaled.irr.pExact);
      }),
      { numRuns: 150 },
    );
  });
});
