import { describe, expect, it } from 'vitest';
import { linearAxis } from '../linear-ticks';

describe('linear axis for a difference', () => {
  it('always includes 0 and steps by 1, 2 or 5 times a power of ten', () => {
    // Newcombe's example (a) in percentage points: 20 (5.24 to 33.39).
    expect(linearAxis([20, 5.243, 33.39])).toEqual({ min: 0, max: 40, step: 10, ticks: [0, 10, 20, 30, 40] });
    expect(linearAxis([-7.22, -8.436, -6.004])).toEqual({ min: -10, max: 0, step: 5, ticks: [-10, -5, 0] });
  });

  it('never prints a tick like 0.30000000000000004', () => {
    const axis = linearAxis([0.05, 0.31]);
    expect(axis.step).toBe(0.1);
    expect(axis.ticks).toEqual([0, 0.1, 0.2, 0.3, 0.4]);
  });

  it('draws a sensible axis for a zero-width or empty input', () => {
    expect(linearAxis([0, 0, 0]).ticks).toEqual([0, 0.5, 1]);
    expect(linearAxis([]).ticks).toEqual([0, 0.5, 1]);
    expect(linearAxis([Infinity, 2]).ticks).toEqual([0, 0.5, 1, 1.5, 2]);
  });
});
