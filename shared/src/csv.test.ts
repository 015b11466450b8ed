import { describe, expect, it } from 'vitest';
import { neutraliseCell, toCsv } from './csv';

// Formula-injection prefixes from the OWASP "CSV Injection" page; quoting rules from RFC 4180.
describe('CSV export', () => {
  it.each([
    ['=SUM(A1:A9)', "'=SUM(A1:A9)"],
    ['+1+1', "'+1+1"],
    ['-2+3', "'-2+3"],
    ['@cmd', "'@cmd"],
    ['\tx', "'\tx"],
    ['\rx', "'\rx"],
    ['Welding bay', 'Welding bay'],
    ['a=b', 'a=b'],
  ])('neutralises %j as %j', (input, output) => {
    expect(neutraliseCell(input)).toBe(output);
  });

  it('keeps numbers as numbers, negative ones included, and spells out infinities', () => {
    expect(neutraliseCell(-7.22)).toBe('-7.22');
    expect(neutraliseCell(0.46)).toBe('0.46');
    expect(neutraliseCell(Infinity)).toBe('Infinity');
    expect(neutraliseCell(-Infinity)).toBe("'-Infinity");
    expect(neutraliseCell(null)).toBe('');
  });

  it('quotes commas, quotes and line breaks and ends every line with CRLF', () => {
    expect(
      toCsv(
        ['group', 'note'],
        [
          ['Paint, line 2', 'said "ok"'],
          ['Stores', 'two\nlines'],
        ],
      ),
    ).toBe('group,note\r\n"Paint, line 2","said ""ok"""\r\nStores,"two\nlines"\r\n');
  });

  it('neutralises before quoting, so a quoted formula still cannot run', () => {
    expect(toCsv(['x'], [['=1,2']])).toBe('x\r\n"\'=1,2"\r\n');
  });
});
