import { describe, expect, it } from 'vitest';
import { benjaminiHochberg } from './multiple-comparisons';
import { expectRelClose } from './test-helpers';
import { StatsValidationError } from './validation';

describe('Benjamini–Hochberg adjusted p-values', () => {
  it('step-up adjustment in input order (Benjamini & Hochberg 1995; worked by hand)', () => {
    // sorted 0.01, 0.03, 0.04, 0.2 (m = 4): 0.04, 0.06, 0.0533, 0.2 → cumulative minimum from the top.
    const adj = benjaminiHochberg([0.01, 0.04, 0.03, 0.2]);
    expectRelClose(adj[0], 0.04, 1e-12);
    expectRelClose(adj[1], 0.16 / 3, 1e-12);
    expectRelClose(adj[2], 0.16 / 3, 1e-12);
    expectRelClose(adj[3], 0.2, 1e-12);
  });

  it('p = 0.01…0.05 all adjust to 0.05 (R p.adjust "BH"; from memory)', () => {
    for (const p of benjaminiHochberg([0.01, 0.02, 0.03, 0.04, 0.05])) expectRelClose(p, 0.05, 1e-12);
  });

  it('keeps nulls, caps at 1, rejects values outside [0, 1]', () => {
    expect(benjaminiHochberg([0.9, null, 0.95])).toEqual([0.95, null, 0.95]);
    expect(() => benjaminiHochberg([1.2])).toThrow(StatsValidationError);
  });
});
