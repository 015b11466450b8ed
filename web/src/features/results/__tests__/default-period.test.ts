import type { RunPeriodIndex } from '@ratewarden/shared/runs';
import { describe, expect, it } from 'vitest';
import { defaultPeriod, isPartialPeriod, latestCompletePeriod } from '../default-period';

// Ratewarden's own rule (shared/src/periods.ts for completeness, README "Small counts" for the yearly windows).
type P = RunPeriodIndex['periods'][number];
const p = (period: string, over: Partial<P> = {}): P => ({ period, completeness: 'complete', everyGroupShown: true, someGroupShown: true, ...over });

describe('the period a results page opens on', () => {
  it('is the latest complete period, not a newer partial one', () => {
    const periods = [p('2025-07-01', { completeness: 'partial' }), p('2025-06-01')];
    expect(defaultPeriod(periods)).toBe('2025-06-01');
    expect(isPartialPeriod(periods, '2025-07-01')).toBe(true);
    expect(isPartialPeriod(periods, '2025-06-01')).toBe(false);
    expect(latestCompletePeriod(periods)).toBe('2025-06-01');
  });

  it('is a period every group is shown in, when a group is read by calendar year only', () => {
    const periods = [p('2025-06-01', { everyGroupShown: false }), p('2025-05-01', { everyGroupShown: false }), p('2024-12-01')];
    expect(defaultPeriod(periods)).toBe('2024-12-01');
  });

  it('falls back to a complete period showing some group, then to the newest', () => {
    const some = [p('2025-06-01', { everyGroupShown: false, someGroupShown: false }), p('2025-05-01', { everyGroupShown: false })];
    expect(defaultPeriod(some)).toBe('2025-05-01');
    const none = [p('2025-06-01', { completeness: 'partial' }), p('2025-05-01', { completeness: 'partial' })];
    expect(defaultPeriod(none)).toBe('2025-06-01');
    expect(latestCompletePeriod(none)).toBeNull();
    expect(defaultPeriod([])).toBeNull();
  });
});
