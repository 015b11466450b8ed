import { describe, expect, it } from 'vitest';
import { auditRange, auditWhenWords } from '../audit-when';

// Calendar arithmetic checked by hand (2026 is not a leap year: 28 days in February).
describe('the audit log date filter', () => {
  it('turns words into an inclusive-from, exclusive-to range of days', () => {
    expect(auditRange('any', '2026-03-05')).toEqual({});
    expect(auditRange('today', '2026-03-05')).toEqual({ from: '2026-03-05', to: '2026-03-06' });
    expect(auditRange('week', '2026-03-05')).toEqual({ from: '2026-02-27', to: '2026-03-06' });
    expect(auditRange('month', '2026-03-05')).toEqual({ from: '2026-02-04', to: '2026-03-06' });
    expect(auditRange('chosen', '2026-03-05', { from: '2026-01-31', to: '2026-02-28' })).toEqual({ from: '2026-01-31', to: '2026-03-01' });
  });
  it('states the range in words', () => {
    expect(auditWhenWords('week')).toBe('in the last 7 days');
    expect(auditWhenWords('chosen', { from: '2026-01-31', to: '2026-02-28' })).toBe('between 31 Jan 2026 and 28 Feb 2026');
  });
});
