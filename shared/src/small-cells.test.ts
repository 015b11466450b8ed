import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { marginSuppression } from './small-cells';

/**
 * Brute force, independent of the rule's formula: every assignment of the withheld parts that a
 * reader cannot tell from the truth (small parts in [1, t − 1], complementary ones ≥ t up to a
 * bound, same withheld sum when the total is published).
 */
function feasibleValues(parts: number[], shown: Array<string | null>, totalShown: boolean, t: number, index: number): Set<number> {
  const withheld = parts.map((_, i) => i).filter((i) => shown[i] !== null);
  const sum = withheld.reduce((a, i) => a + parts[i]!, 0);
  const ranges = withheld.map((i) => (shown[i] === 'small' ? [1, t - 1] : [t, sum + t]) as [number, number]);
  const values = new Set<number>();
  const walk = (j: number, acc: number[]) => {
    if (j === withheld.length) {
      if (!totalShown || acc.reduce((a, b) => a + b, 0) === sum) values.add(acc[withheld.indexOf(index)]!);
      return;
    }
    for (let v = ranges[j]![0]; v <= ranges[j]![1]; v++) walk(j + 1, [...acc, v]);
  };
  walk(0, []);
  return values;
}

describe('complementary suppression of the parts of a published total', () => {
  it('one small site beside larger ones: the smallest shown site is withheld with it', () => {
    expect(marginSuppression([3, 7, 12], 5)).toEqual({ parts: ['small', 'complement', null], total: false });
  });

  it('nothing small: nothing withheld; zeros are shown', () => {
    expect(marginSuppression([0, 7, 12], 5)).toEqual({ parts: [null, null, null], total: false });
  });

  it('two small parts that could only be 1 and 1 get a complement; 2 and 3 do not need one', () => {
    expect(marginSuppression([1, 1, 9], 5).parts).toEqual(['small', 'small', 'complement']);
    expect(marginSuppression([2, 3, 9], 5).parts).toEqual(['small', 'small', null]);
  });

  it('a small part with only zeros beside it: the total goes (it is the part itself)', () => {
    expect(marginSuppression([0, 3], 5)).toEqual({ parts: [null, 'small'], total: false }); // total 3 is small in its own right
    expect(marginSuppression([4, 4], 5)).toEqual({ parts: ['small', 'small'], total: true }); // 8 = 4 + 4 pins both
  });

  it('complements of 5 and 6 beside a 1 would leave it 1 … 2 (12 − 5 − 5); a third complement is added', () => {
    const r = marginSuppression([1, 5, 6, 20], 5);
    expect(r.parts).toEqual(['small', 'complement', 'complement', 'complement']);
  });

  // From a threshold of 3 up: with 2 a withheld count could only be 1, so the settings refuse it.
  it('a withheld sum of 7 in two small parts would narrow each to 3 … 4: a complement is added', () => {
    expect(marginSuppression([3, 4, 100], 5).parts).toEqual(['small', 'small', 'complement']);
  });

  it('property: no small part can be narrowed below 1 … threshold − 1 by subtraction (brute force over what a reader can see)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 14 }), { minLength: 1, maxLength: 5 }), fc.integer({ min: 3, max: 6 }), (parts, t) => {
        const r = marginSuppression(parts, t);
        const total = parts.reduce((a, b) => a + b, 0);
        const totalShown = !r.total && !(total > 0 && total < t);
        parts.forEach((c, i) => {
          if (r.parts[i] !== 'small') return void (c > 0 && c < t && expect.fail('a small part was shown'));
          const values = feasibleValues(parts, r.parts, totalShown, t, i);
          expect(Math.min(...values)).toBe(1);
          expect(Math.max(...values)).toBe(t - 1);
        });
      }),
      { numRuns: 300 },
    );
  });
});
