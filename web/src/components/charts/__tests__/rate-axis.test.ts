import { describe, expect, it } from 'vitest';
import { linearAxis, logAxis, niceCeil, quantile } from '../rate-axis';

describe('rate chart axes', () => {
  it.each([
    [0.7, 1],
    [1, 1],
    [1.2, 2],
    [2.2, 2.5],
    [3, 5],
    [37, 50],
    [240, 250],
    [0.031, 0.05],
  ])('niceCeil(%s) = %s (the 1-2-2.5-5 steps, common practice)', (x, y) => {
    expect(niceCeil(x)).toBe(y);
  });

  it('computes quartiles as R does by default (type 7)', () => {
    // R: quantile(c(1, 2, 3, 4, 10), c(.25, .75)) gives 2 and 4.
    expect(quantile([1, 2, 3, 4, 10], 0.25)).toBe(2);
    expect(quantile([1, 2, 3, 4, 10], 0.75)).toBe(4);
    // R: quantile(c(1, 2, 3, 4), .25) gives 1.75.
    expect(quantile([1, 2, 3, 4], 0.25)).toBe(1.75);
  });

  it('stops a linear axis at the far-out fence when one value lies beyond it', () => {
    // Rates 10..15 and one month at 400: Q1 = 11.25, Q3 = 14.5 (type 7), fence 14.5 + 3 × 3.25 = 24.25 → 25.
    const a = linearAxis([10, 11, 12, 13, 14, 15, 400]);
    expect(a).toEqual({ max: 25, clipped: true });
  });

  it('covers every value when none is far out, and when there are too few to tell', () => {
    expect(linearAxis([10, 11, 12, 13, 14, 15, 18])).toEqual({ max: 20, clipped: false });
    expect(linearAxis([1, 400])).toEqual({ max: 500, clipped: false });
    expect(linearAxis([])).toEqual({ max: 1, clipped: false });
  });

  it('bounds a log axis by powers of ten around the positive values', () => {
    expect(logAxis([0, 0.42, 3.1, 87])).toEqual({ min: 0.1, max: 100 });
    expect(logAxis([5])).toEqual({ min: 1, max: 10 });
  });
});
