import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { marginSuppression, nestedSuppression, splitSuppression } from './small-cells';

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

describe('a count split into parts, both published', () => {
  it('nothing small: everything shown, zeros too', () => {
    expect(splitSuppression([6, 0, 7], 5)).toEqual({ total: null, parts: [null, null, null] });
  });

  it('a small total goes with every part, zeros included (they would say which parts are empty)', () => {
    expect(splitSuppression([2, 0, 1], 5)).toEqual({ total: 'small', parts: ['total', 'total', 'total'] });
  });

  it('a small part beside a larger one: the larger is its complement and the total stays', () => {
    expect(splitSuppression([2, 7, 9], 5)).toEqual({ total: null, parts: ['small', 'complement', null] });
  });

  it('a small part with one complement only (2 = 8 − 6 would be 1 to 3): the total goes too', () => {
    expect(splitSuppression([6, 2], 5)).toEqual({ total: 'complement', parts: ['total', 'total'] });
  });

  it('zero total: shown, it points at nobody', () => {
    expect(splitSuppression([0, 0, 0], 5)).toEqual({ total: null, parts: [null, null, null] });
  });
});

describe('a two-level table under a published grand total', () => {
  it('a group whose parts would give a small one back goes whole; the others stay', () => {
    expect(
      nestedSuppression(
        [
          [6, 2],
          [9, 0],
        ],
        5,
      ),
    ).toEqual({
      totals: ['complement', null],
      parts: [
        ['total', 'total'],
        [null, null],
      ],
    });
  });

  it('a small group total takes a complement among the group totals, and both groups go whole', () => {
    expect(
      nestedSuppression(
        [
          [6, 0],
          [3, 1],
        ],
        5,
      ),
    ).toEqual({
      totals: ['complement', 'small'],
      parts: [
        ['total', 'total'],
        ['total', 'total'],
      ],
    });
  });

  it('no withheld count can be got back: brute force over small tables', () => {
    // Every part and group total a reader sees as a number is not small; every small count is withheld.
    fc.assert(
      fc.property(fc.array(fc.array(fc.integer({ min: 0, max: 9 }), { minLength: 1, maxLength: 3 }), { minLength: 1, maxLength: 3 }), (groups) => {
        const s = nestedSuppression(groups, 5);
        groups.forEach((g, i) => {
          const total = g.reduce((a, b) => a + b, 0);
          if (total > 0 && total < 5) expect(s.totals[i]).not.toBeNull();
          g.forEach((c, j) => {
            if (c > 0 && c < 5) expect(s.parts[i]![j]).not.toBeNull();
          });
          // A shown group total with its parts: the withheld parts are a plain margin problem, which marginSuppression guards.
          if (s.totals[i] === null) {
            const shown = s.parts[i]!;
            expect(shown.every((p) => p !== 'total')).toBe(true);
            g.forEach((c, j) => {
              if (shown[j] === 'small') expect(feasibleValues(g, shown, true, 5, j)).toEqual(new Set([1, 2, 3, 4]));
            });
          }
        });
      }),
      { numRuns: 300 },
    );
  });
});
