import { describe, expect, it } from 'vitest';
import { periodName, windowName, windowPeriodText } from '../window-text';

/** How the results pages word the windows (quarters numbered as usual, common practice: Q1 = January–March). */
describe('window wording', () => {
  const settings = { windows: ['month', 'quarter', 'year', 'whole'] as const, wholePeriodStart: '2024-03-01' };
  const s = { windows: [...settings.windows], wholePeriodStart: settings.wholePeriodStart };

  it('names each period of the period choice', () => {
    expect(periodName('quarter', '2025-06-01', s)).toBe('Q2 2025');
    expect(periodName('quarter', '2025-12-01', s)).toBe('Q4 2025');
    expect(periodName('year', '2025-12-01', s)).toBe('2025');
    expect(periodName('whole', '2025-02-01', s)).toBe('Mar 2024 to Feb 2025');
    expect(periodName('rolling12', '2025-02-01', s)).toBe('Feb 2025');
  });

  it('says the span a figure covers, and the whole period its start', () => {
    expect(windowPeriodText('quarter', '2025-03-01', s)).toBe('calendar quarter Q1 2025 (Jan 2025 to Mar 2025)');
    expect(windowPeriodText('year', '2025-12-01', s)).toBe('calendar year 2025');
    expect(windowPeriodText('month', '2025-05-01', s)).toBe('month of May 2025');
    expect(windowName('whole', s)).toBe('Whole period from Mar 2024');
    expect(windowName('quarter', s)).toBe('Calendar quarter');
  });
});
