import { describe, expect, it } from 'vitest';
import type { Cell } from './cells-query';
import { cellsLines, copyValue } from './copy-lines';

// COPY text format and array literals as the PostgreSQL 15 documentation describes them
// ("COPY", File Formats: Text Format; "Arrays", Array Value Input).
describe('COPY text of a run', () => {
  it('writes null, infinities, booleans and escapes tabs, newlines and backslashes', () => {
    expect([null, undefined, Number.NaN, Infinity, -Infinity, true, false, 0.1].map(copyValue)).toEqual([
      '\\N',
      '\\N',
      '\\N',
      'Infinity',
      '-Infinity',
      't',
      'f',
      '0.1',
    ]);
    expect(copyValue('a\tb\nc\\d')).toBe('a\\tb\\nc\\\\d');
    expect(copyValue({ upper: Infinity })).toBe('{"upper":"Infinity"}');
  });

  it('stores the cells of each outcome × group as parallel arrays, with null elements and exact hours', () => {
    const cell = (groupId: number, month: string, ageBand: number | null, sex: string | null, cents: number, cases: number): Cell => ({
      outcomeId: 7,
      month,
      siteId: 3,
      groupId,
      ageBand,
      sex,
      cents,
      cases,
    });
    const text = cellsLines('r1', [
      cell(1, '2031-01-01', 40, 'F', 16_000, 2),
      cell(2, '2031-01-01', null, null, 5, 0),
      cell(1, '2031-02-01', 30, 'a"b\\c', 123_456, 1),
    ]);
    expect(text.split('\n')).toEqual([
      'r1\t7\t1\t{2031-01-01,2031-02-01}\t{3,3}\t{40,30}\t{"F","a\\\\"b\\\\\\\\c"}\t{160.00,1234.56}\t{2,1}',
      'r1\t7\t2\t{2031-01-01}\t{3}\t{NULL}\t{NULL}\t{0.05}\t{0}',
      '',
    ]);
  });
});
