import { describe, expect, it } from 'vitest';
import { chiSquareQuantile, chiSquareUpperTail, normalQuantile, poissonLowerTail, poissonUpperTail, zForConfidence } from './distributions';
import { expectRelClose } from './test-helpers';

describe('distributions (stdlib wrappers)', () => {
  it('normal and chi-square quantiles', () => {
    expectRelClose(normalQuantile(0.975), 1.959963984540054, 1e-12); // z_0.975 (Abramowitz & Stegun 1964, Table 26.5; from memory)
    expectRelClose(zForConfidence(0.9), 1.6448536269514722, 1e-12); // z_0.95 (A&S Table 26.5; from memory)
    expectRelClose(chiSquareQuantile(0.975, 2), 7.377758908227871, 1e-12); // −2 ln 0.025 (closed form for 2 df)
  });

  it('chi-square upper tail keeps tiny p-values', () => {
    expectRelClose(chiSquareUpperTail(3.841458820694124, 1), 0.05, 1e-12); // χ²_0.95(1) = 1.96² (A&S Table 26.8; from memory)
    expectRelClose(chiSquareUpperTail(200, 2), Math.exp(-100), 1e-12); // 2-df tail is exp(−q/2) (closed form)
    expect(chiSquareUpperTail(0, 3)).toBe(1);
  });

  it('Poisson tails are accurate for large counts, where stdlib gammainc is not (checked against SciPy)', () => {
    // SciPy 1.10.1 special.gammaincc(15844, 16091.65223470097) = 0.025000000000000307
    expectRelClose(poissonLowerTail(15843, 16091.65223470097), 0.025000000000000307, 1e-9);
    // Exact identity: P(X ≤ x) + P(X ≥ x + 1) = 1
    expectRelClose(poissonLowerTail(5000, 5000) + poissonUpperTail(5001, 5000), 1, 1e-14);
    expectRelClose(poissonUpperTail(1, 1), 1 - Math.exp(-1), 1e-14); // P(X ≥ 1) = 1 − e^{−μ}
  });
});
