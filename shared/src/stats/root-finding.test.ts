import { describe, expect, it } from 'vitest';
import { brentRoot, increasingRoot } from './root-finding';
import { expectRelClose } from './test-helpers';

describe('root finding', () => {
  it('Brent finds √2 and ln 10 to machine precision', () => {
    expectRelClose(
      brentRoot((x) => x * x - 2, 0, 2),
      Math.SQRT2,
      1e-15,
    );
    expectRelClose(
      increasingRoot((t) => Math.exp(t) - 10, 0),
      Math.LN10,
      1e-14,
    );
    expectRelClose(
      increasingRoot((t) => t - 1e4, 0),
      1e4,
      1e-14,
    ); // far from the start
  });

  it('refuses an interval that does not bracket a root (a caller bug)', () => {
    expect(() => brentRoot((x) => x * x + 1, -1, 1)).toThrow(RangeError);
  });
});
