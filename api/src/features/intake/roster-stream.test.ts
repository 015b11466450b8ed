import { describe, expect, it } from 'vitest';
import { reasons } from '@ratewarden/shared/intake-columns';
import { rowSchema } from '@ratewarden/shared/intake-schemas';
import type { CodeMap } from './roster-cell-verdict';
import { RosterStream } from './roster-stream';

const codes = {
  site: new Map([['NFD', { id: 7, code: 'NFD' }]]) as CodeMap,
  exposure_group: new Map([
    ['FETTLING', { id: 3, code: 'FETTLING' }],
    ['OFFICE', { id: 4, code: 'office' }],
  ]) as CodeMap,
};
const header = ['worker_key', 'site', 'exposure_group', 'month', 'hours', 'birth_year', 'sex', 'job_title'];

/** Feeds `body` (the rows after the header) in chunks of `size` bytes; returns the COPY text and the stream. */
async function run(body: string | Buffer, size = 1 << 20, opts: { delimiter?: ',' | ';'; eol?: '\n' | '\r'; columns?: string[] } = {}) {
  const s = new RosterStream(opts.columns ?? header, opts.delimiter ?? ',', opts.eol ?? '\n', codes);
  const bytes = typeof body === 'string' ? Buffer.from(body) : body;
  const out: Buffer[] = [];
  s.on('data', (d: Buffer) => out.push(d));
  const done = new Promise<void>((resolve, reject) => s.on('end', resolve).on('error', reject));
  for (let i = 0; i < bytes.length; i += size) s.write(bytes.subarray(i, i + size));
  s.end();
  await done;
  return { text: Buffer.concat(out).toString('utf8'), s };
}

describe('RosterStream (the roster upload hot path)', () => {
  const rows =
    [
      'W1,NFD,FETTLING,2024-01,151.5,1980,F,Grinder',
      'W1,nfd,fettling,2024-02,"151,25",1980,f,"Fettler, ""senior"""',
      'W2,NFD,OFFICE,2024-01,0,1975,M,"two',
      'lines"',
      'W3,NFD,OFFICE,2024-01,744,1990,X,Schweißer\\tab',
    ].join('\n') + '\n';
  // Expected COPY text written by hand from RFC 4180 quoting and PostgreSQL's COPY text escapes.
  const expected =
    [
      '2\tW1\t7\t3\t2024-01-01\t151.5\t1980\tF\tGrinder',
      '3\tW1\t7\t3\t2024-02-01\t151.25\t1980\tF\tFettler, "senior"',
      '4\tW2\t7\t4\t2024-01-01\t0\t1975\tM\ttwo\\nlines',
      '6\tW3\t7\t4\t2024-01-01\t744\t1990\tX\tSchweißer\\\\tab',
    ].join('\n') + '\n';

  it('splits quoted fields (separators, doubled quotes, line breaks) into typed COPY rows', async () => {
    const { text, s } = await run(rows);
    expect(text).toBe(expected);
    expect(s.rows).toBe(4);
    expect(s.problemCount).toBe(0);
  });

  it('gives the same rows whatever the chunk boundaries (inside quotes, inside a UTF-8 character)', async () => {
    for (const size of [1, 2, 3, 7, 16]) expect((await run(rows, size)).text).toBe(expected);
  });

  it('reads semicolons and lone CR line endings', async () => {
    const { text } = await run('W9;NFD;OFFICE;2024-03;"12,5";1999;F;\r', 4, { delimiter: ';', eol: '\r' });
    expect(text).toBe('2\tW9\t7\t4\t2024-03-01\t12.5\t1999\tF\t\\N\n');
  });

  it('reports each bad cell with the same reason the zod row schema gives', async () => {
    const bad = ['W 1,NFD,FETTLING,2024-13,745,19x0,Q,', 'W2,XXX,NOPE,2024-01,,1980,F,'];
    const { s, text } = await run(`${bad.join('\n')}\n`);
    expect(s.problemCount).toBe(8);
    expect(text.split('\n')[0]).toBe('2\t\\N\t7\t3\t\\N\t\\N\t\\N\t\\N\t\\N');
    const zodReasons = (line: string) => {
      const cells = Object.fromEntries(header.map((h, i) => [h, line.split(',')[i]!]));
      const r = rowSchema('roster').safeParse(cells);
      return r.success ? [] : r.error.issues.map((i) => i.message);
    };
    // The zod schema does not know stored codes; the unknown-code reasons are the shared wording.
    expect(
      s.problems
        .filter((p) => p.line === 2)
        .map((p) => p.reason)
        .sort(),
    ).toEqual(zodReasons(bad[0]!).sort());
    expect(s.problems.filter((p) => p.line === 3)).toEqual([
      { line: 3, column: 'site', value: 'XXX', reason: reasons.unknownCode('site', 'site') },
      { line: 3, column: 'exposure_group', value: 'NOPE', reason: reasons.unknownCode('exposure_group', 'exposure_group') },
      { line: 3, column: 'hours', value: null, reason: reasons.empty('hours') },
    ]);
  });

  it('tallies workers and site × months, and notices months that do not increase', async () => {
    const { s } = await run('W1,NFD,OFFICE,2024-01,10.25,1980,F,\nW1,NFD,OFFICE,2024-02,20,1981,F,\nW2,NFD,OFFICE,2024-02,5,1970,M,\n');
    expect(s.tallies.monthsIncrease).toBe(true);
    expect(s.tallies.workers.get('W1')).toMatchObject({ byMin: 1980, byMax: 1981, sexMin: 'F', sexMax: 'F' });
    // Hours in hundredths by hand: January 1025; February 2000 + 500.
    expect([...s.tallies.slices.values()].map((x) => [x.month, x.n, x.cents])).toEqual([
      ['2024-01', 1, 1025],
      ['2024-02', 2, 2500],
    ]);
    const again = await run('W1,NFD,OFFICE,2024-02,1,1980,F,\nW1,NFD,OFFICE,2024-01,1,1980,F,\n');
    expect(again.s.tallies.monthsIncrease).toBe(false);
  });

  it('stops on rows it cannot read, naming the line', async () => {
    await expect(run('W1,NFD,OFFICE,2024-01,1,1980,F,\n\nW2,NFD,OFFICE,2024-01,1,1980,F,\n')).rejects.toThrow(/fewer fields than the header \(line 3\)/);
    await expect(run('W1,NFD,OFFICE,2024-01,1,1980,F,,\n')).rejects.toThrow(/more fields than the header \(line 2\)/);
    await expect(run('W1,NFD,OFFICE,2024-01,1,1980,F,"open\n')).rejects.toThrow(/quoted value is never closed \(line 2\)/);
    await expect(run(Buffer.from('W1,NFD,OFFICE,2024-01,1,1980,F,\nW2,NFD,OFFICE,2024-01,1,1980,F,Caf\xe9\n', 'latin1'), 5)).rejects.toThrow(
      /not UTF-8 text \(line 3\)/,
    );
    await expect(run(Buffer.from('W1,NFD,OFFICE,2024-01,1,1980,F,\0\n', 'latin1'))).rejects.toThrow(/zero byte\) \(line 2\)/);
  });
});
