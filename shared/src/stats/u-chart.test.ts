import { describe, expect, it } from 'vitest';
import { uChart } from './u-chart';
import { expectRelClose } from './test-helpers';

describe('u-chart', () => {
  it('centre line and 3-sigma limits vary with exposure (Montgomery; worked by hand)', () => {
    // ū = 12/6 = 2; period 1: n = 1 → UCL = 2 + 3√2, LCL = max(0, 2 − 3√2) = 0; period 2: n = 5 → 2 ± 3√0.4.
    const r = uChart([
      { count: 2, exposure: 1 },
      { count: 10, exposure: 5 },
    ]);
    expect(r.centre).toBe(2);
    expectRelClose(r.points[0]!.ucl, 2 + 3 * Math.SQRT2, 1e-12);
    expect(r.points[0]!.lcl).toBe(0);
    expectRelClose(r.points[1]!.lcl, 2 - 3 * Math.sqrt(0.4), 1e-12);
    expect(r.points[1]!.signal).toBe('within');
    expect(r.methods.limits).toMatch(/Montgomery/);
  });

  it('flags a period above the UCL, and gives exact Poisson probability limits', () => {
    const r = uChart([
      { count: 1, exposure: 1 },
      { count: 1, exposure: 1 },
      { count: 1, exposure: 1 },
      { count: 12, exposure: 1 },
    ]);
    expect(r.points[3]!.signal).toBe('above');
    expect(r.points[3]!.exactUcl).toBeGreaterThan(r.centre as number);
  });

  it('a period without exposure is undefined, with a reason', () => {
    const r = uChart([
      { count: 0, exposure: 0 },
      { count: 3, exposure: 2 },
    ]);
    expect(r.points[0]!.u).toBeNull();
    expect(r.reasons[0]!.field).toBe('points[0]');
  });
});
