import type { ExposureGroupDto } from '@ratewarden/shared/groups';
import type { RunResult } from '@ratewarden/shared/runs';
import { describe, expect, it } from 'vitest';
import { levelRows, trendOf } from '../trend-levels';

const group = (id: number, level: number | null): ExposureGroupDto => ({
  id,
  code: `G${id}`,
  name: `Group ${id}`,
  hazard: 'test',
  exposureLevel: level,
  isReference: id === 1,
  description: null,
  updatedAt: '2024-01-01T00:00:00Z',
});
const result = (groupId: number, cases: number | null, personTime: number) =>
  ({ exposureGroupId: groupId, cases, personTime, suppressed: cases === null }) as RunResult;

describe('trend across exposure levels from run results', () => {
  it('sums groups that share a level and leaves out groups without one', () => {
    const rows = levelRows(
      [result(1, 10, 1000), result(2, 5, 400), result(3, 15, 600), result(4, 99, 99)],
      [group(1, 0), group(2, 1), group(3, 1), group(4, null)],
    );
    expect(rows).toEqual([
      { level: 0, groups: ['Group 1'], cases: 10, personTime: 1000, withheld: false },
      { level: 1, groups: ['Group 2', 'Group 3'], cases: 20, personTime: 1000, withheld: false },
    ]);
  });

  it('gives the score test of the statistics core: levels 0 and 1, 10 and 20 cases in 1000 each', () => {
    // Hand computation (common practice): O₊ = 30, E = (15, 15), U = 1·(20 − 15) = 5,
    // Var U = Σx²E − (ΣxE)²/O₊ = 15 − 225/30 = 7.5, χ² = 25/7.5 = 3.3333, p = 0.0679 (1 df).
    const t = trendOf(
      [
        { level: 0, groups: [], cases: 10, personTime: 1000, withheld: false },
        { level: 1, groups: [], cases: 20, personTime: 1000, withheld: false },
      ],
      { confidence: 0.95, per: 1000 },
    );
    expect(t?.chi2).toBeCloseTo(3.3333333, 6);
    expect(t?.p).toBeCloseTo(0.0678892, 5);
  });

  it('is withheld when a level holds a count the server suppressed (a partial sum would give a wrong test)', () => {
    const rows = levelRows([result(1, 10, 1000), result(2, null, 400), result(3, 15, 600)], [group(1, 0), group(2, 1), group(3, 1)]);
    expect(rows[1]?.withheld).toBe(true);
    expect(trendOf(rows, { confidence: 0.95, per: 1000 })).toBeNull();
  });

  it('needs two levels', () => {
    expect(trendOf([{ level: 0, groups: [], cases: 1, personTime: 1, withheld: false }], { confidence: 0.95, per: 1 })).toBeNull();
  });
});
