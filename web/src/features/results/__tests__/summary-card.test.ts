import { describe, expect, it } from 'vitest';
import { summaryWords } from '../summary-card';

const base = { none: 'No flags waiting for review', some: (n: number) => `${n} ${n === 1 ? 'flag' : 'flags'} waiting for review`, tone: 'alarm' as const };

describe('overview summary cards', () => {
  it('say something useful at zero, in the calm tone', () => {
    expect(summaryWords({ ...base, count: 0, failed: false })).toEqual({ text: 'No flags waiting for review', tone: 'good', big: false });
  });
  it('give the count with its words and tone above zero', () => {
    expect(summaryWords({ ...base, count: 1, failed: false })).toEqual({ text: '1 flag waiting for review', tone: 'alarm', big: true });
    expect(summaryWords({ ...base, count: 3, failed: false })).toEqual({ text: '3 flags waiting for review', tone: 'alarm', big: true });
  });
  it('say when the count is not known', () => {
    expect(summaryWords({ ...base, count: undefined, failed: true }).text).toBe('Not available just now');
    expect(summaryWords({ ...base, count: undefined, failed: false }).text).toBe('Counting…');
  });
});
