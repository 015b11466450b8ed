import { describe, expect, it } from 'vitest';
import { expectedCount, poissonMinLikelihoodP, standardizedIncidenceRatio } from './sir';
import { expectRelClose } from './test-helpers';

describe('standardized incidence ratio', () => {
  it('exact (Ulm) limits are the Garwood limits on O divided by E', () => {
    const r = standardizedIncidenceRatio(10, 5);
    expect(r.sir).toBe(2);
    expectRelClose(r.exact.lower, 4.795388696 / 5, 1e-8); // Ulm 1990; Garwood 1936 (x = 10: 4.795–18.39)
    expectRelClose(r.exact.upper, 18.39035604 / 5, 1e-8);
    expect(r.methods.exact).toMatch(/Ulm/);
  });

  it('Byar limits for O = 8, E = 3.59 are 0.960–4.391 (Rothman & Boice 1979 formula; R 4.2.2)', () => {
    const r = standardizedIncidenceRatio(8, 3.59);
    expectRelClose(r.byar.lower, 0.96, 1e-3);
    expectRelClose(r.byar.upper, 4.391, 1e-3);
  });

  it('O = 0: SIR 0 with upper limit 3.689/E; E = 0 is undefined', () => {
    const r = standardizedIncidenceRatio(0, 2);
    expect(r.sir).toBe(0);
    expectRelClose(r.exact.upper, 3.688879454 / 2, 1e-8); // Garwood 1936
    const u = standardizedIncidenceRatio(3, 0);
    expect(u.sir).toBeNull();
    expect(u.reasons[0]).toEqual({ field: 'sir', reason: 'expected count is 0' });
  });

  it('expected count from reference rates × person-time', () => {
    expect(
      expectedCount([
        { personTime: 1000, referenceRate: 0.002 },
        { personTime: 500, referenceRate: 0.01 },
      ]),
    ).toBe(7);
  });

  it('minimum-likelihood p: ties and both sides (hand-computed from the Poisson pmf; common practice)', () => {
    expect(poissonMinLikelihoodP(0, 1)).toBe(1);
    // μ = 2, x = 5: P(5) = 0.036 and every count below the mean is more likely (P(0) = 0.135), so p = P(X ≥ 5).
    expectRelClose(poissonMinLikelihoodP(5, 2), 1 - Math.exp(-2) * (1 + 2 + 2 + 4 / 3 + 2 / 3), 1e-12);
  });
});
