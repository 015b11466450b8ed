import { describe, expect, it } from 'vitest';
import { withheldPeriods, withheldWords } from '../withheld-points';

describe('withheld points on a trend chart', () => {
  const series = [
    { name: 'Group A', points: [{ period: '2032-10' }, { period: '2032-11', withheld: true }, { period: '2032-12' }] },
    { name: 'Group B', points: [{ period: '2032-10' }, { period: '2032-11', withheld: true }, { period: '2032-12', withheld: true }] },
  ];
  it('marks each period once, naming every group withheld there', () => {
    expect(withheldPeriods(['2032-10', '2032-11', '2032-12'], series)).toEqual([
      { period: '2032-11', groups: ['Group A', 'Group B'] },
      { period: '2032-12', groups: ['Group B'] },
    ]);
  });
  it('lists a few periods by name and counts many', () => {
    expect(withheldWords(withheldPeriods(['2032-10', '2032-11', '2032-12'], series), 3)).toBe('2032-11 (Group A, Group B); 2032-12 (Group B)');
    const many = Array.from({ length: 7 }, (_, i) => ({ period: `2030-0${i + 1}`, groups: ['Group A'] }));
    expect(withheldWords(many, 36)).toBe('7 of the 36 periods shown (the table lists each)');
  });
});
