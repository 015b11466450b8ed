import type { RunResult } from '@ratewarden/shared/runs';
import { describe, expect, it } from 'vitest';
import { defaultPeriod, isPartialPeriod } from '../default-period';

// Ratewarden's own rule (shared/src/periods.ts for completeness, README "Small counts" for the yearly windows).
const row = (period: string, group: number, over: Partial<RunResult> = {}): RunResult =>
  ({ window: 'rolling12', period, exposureGroupId: group, withheld: null, completeness: 'complete', ...over }) as RunResult;

describe('the period a results page opens on', () => {
  it('is the latest complete period, not a newer partial one', () => {
    const results = [row('2025-06-01', 1), row('2025-06-01', 2), row('2025-07-01', 1, { completeness: 'partial' }), row('2025-07-01', 2, { completeness: 'partial' })];
    expect(defaultPeriod(results, 'rolling12')).toBe('2025-06-01');
    expect(isPartialPeriod(results, 'rolling12', '2025-07-01')).toBe(true);
    expect(isPartialPeriod(results, 'rolling12', '2025-06-01')).toBe(false);
  });

  it('is a period every group is shown in, when a group is read by calendar year only', () => {
    const results = [
      row('2024-12-01', 1), row('2024-12-01', 2),
      row('2025-05-01', 1), row('2025-05-01', 2, { withheld: 'months' }),
      row('2025-06-01', 1), row('2025-06-01', 2, { withheld: 'months' }),
    ];
    expect(defaultPeriod(results, 'rolling12')).toBe('2024-12-01');
  });

  it('falls back to a complete period showing some group, then to the newest', () => {
    const some = [row('2025-05-01', 1, { withheld: 'months' }), row('2025-05-01', 2), row('2025-06-01', 1, { withheld: 'months' }), row('2025-06-01', 2, { withheld: 'months' })];
    expect(defaultPeriod(some, 'rolling12')).toBe('2025-05-01');
    const none = [row('2025-05-01', 1, { completeness: 'partial' }), row('2025-06-01', 1, { completeness: 'partial' })];
    expect(defaultPeriod(none, 'rolling12')).toBe('2025-06-01');
    expect(defaultPeriod([], 'rolling12')).toBeNull();
  });

  it('looks at the chosen window only', () => {
    const results = [row('2025-07-01', 1, { window: 'month' }), row('2025-06-01', 1)];
    expect(defaultPeriod(results, 'month')).toBe('2025-07-01');
    expect(defaultPeriod(results, 'rolling12')).toBe('2025-06-01');
  });
});
