import { compareRates, compareRisks } from '@ratewarden/shared/stats';
import { describe, expect, it } from 'vitest';
import { rateReading, riskReading } from '../reading';

describe('plain-language readings', () => {
  it('reads a rate ratio below 1 as lower, with its interval', () => {
    // Feychting, Osterlund & Ahlbom, Epidemiology 1998;9:490-494: 136/22050 vs 1709/127650 person-years;
    // published IRR 0.46 (0.38 to 0.55), rate difference -7.22 (-8.43 to -6.00) per 1000 PY (as printed in the epiR::epi.2by2 help page, example 5).
    const r = compareRates({ cases: 136, personTime: 22050 }, { cases: 1709, personTime: 127650 }, { per: 1000 });
    const [ratio, diff] = rateReading(r, 'exact', 'per 1,000 person-years');
    expect(ratio).toContain('0.461 times the rate in the reference group (lower, not higher; 95% CI 0.384 to 0.549, exact conditional)');
    expect(ratio).toContain('The interval excludes 1.');
    expect(diff).toContain('7.22 fewer cases per 1,000 person-years');
  });

  it('says when the interval includes 1', () => {
    // 3 vs 2 cases in equal person-time: IRR 1.5 whose exact interval obviously spans 1 (from memory: 0.17 to 18).
    const r = compareRates({ cases: 3, personTime: 100 }, { cases: 2, personTime: 100 });
    expect(rateReading(r, 'midP', 'per person-year')[0]).toContain('compatible with no difference in rates');
  });

  it('explains why a ratio is undefined', () => {
    const r = compareRates({ cases: 0, personTime: 100 }, { cases: 0, personTime: 100 });
    expect(rateReading(r, 'exact', 'per person-year')[0]).toMatch(/^The rate ratio cannot be computed: .+\.$/);
  });

  it('reads the number needed to harm from a 2×2 table', () => {
    // Newcombe, Stat Med 1998;17:873-890, Table II example (a): 56/70 vs 48/80, RD 0.2 (Newcombe 0.0524 to 0.3339), NNT 5.
    const lines = riskReading(compareRisks({ cases: 56, total: 70 }, { cases: 48, total: 80 }), 'newcombe');
    expect(lines[1]).toContain(
      '20% of the people in each group, higher among the exposed (95% CI 5.24% to 33.4% for exposed minus reference, Newcombe hybrid score)',
    );
    expect(lines[2]).toContain('one additional case for every 5 people exposed (number needed to harm).');
  });

  it('reads the risk difference by the preferred method', () => {
    // Newcombe, Stat Med 1998;17:873-890, Table II example (a): method 6 (Miettinen–Nurminen) 0.0528 to 0.3382.
    const lines = riskReading(compareRisks({ cases: 56, total: 70 }, { cases: 48, total: 80 }), 'miettinenNurminen');
    expect(lines[1]).toContain('95% CI 5.28% to 33.8% for exposed minus reference, Miettinen–Nurminen score');
  });
});
