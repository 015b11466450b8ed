import { describe, expect, it } from 'vitest';
import { exportCount, setSmallCellThreshold, showCount, smallCellThreshold } from '../small-cells';

// The rule (suppress counts under the threshold for everyone but the physician) is Ratewarden's
// own, from DESIGN.md; 5 as the default threshold is common practice in health-statistics releases.
describe('small-cell suppression', () => {
  it.each(['hygienist', 'safety_manager', 'administrator', null] as const)('hides counts 1 to 4 from %s, and shows zero', (role) => {
    for (const n of [1, 4]) expect(showCount(n, role)).toEqual({ text: '<5', value: null, suppressed: true });
    expect(showCount(0, role)).toEqual({ text: '0', value: 0, suppressed: false });
    expect(showCount(5, role)).toEqual({ text: '5', value: 5, suppressed: false });
  });

  it('shows a count the API withheld as withheld, not as missing', () => {
    expect(showCount(null, 'safety_manager', 5, true)).toEqual({ text: '<5', value: null, suppressed: true });
    expect(showCount(null, 'safety_manager')).toEqual({ text: 'not available', value: null, suppressed: false });
    expect(exportCount(null, 'hygienist', 5, true)).toBe('<5');
  });

  it('shows the physician every count', () => {
    expect(showCount(1, 'physician')).toEqual({ text: '1', value: 1, suppressed: false });
    expect(showCount(0, 'physician').text).toBe('0');
  });

  it('takes a configurable threshold', () => {
    expect(showCount(9, 'hygienist', 10).text).toBe('<10');
    expect(showCount(10, 'hygienist', 10).text).toBe('10');
    expect(showCount(2, 'hygienist', 3).text).toBe('<3');
    expect(showCount(3, 'hygienist', 3).text).toBe('3');
  });

  it('groups thousands and exports the suppressed text, never the number', () => {
    expect(showCount(12345, 'safety_manager').text).toBe('12,345');
    expect(exportCount(3, 'safety_manager')).toBe('<5');
    expect(exportCount(3, 'physician')).toBe(3);
    expect(exportCount(null, 'hygienist')).toBeNull();
  });

  it('takes the threshold the server sends in the session, for every count shown', () => {
    try {
      setSmallCellThreshold(7);
      expect(smallCellThreshold()).toBe(7);
      expect(showCount(6, 'hygienist').text).toBe('<7');
      expect(showCount(null, 'hygienist', undefined, 'small').text).toBe('<7');
      expect(showCount(null, 'hygienist', undefined, 'complement').text).toBe('withheld');
      expect(exportCount(6, 'safety_manager')).toBe('<7');
      expect(showCount(7, 'hygienist').text).toBe('7');
    } finally {
      setSmallCellThreshold(5);
    }
  });
});
