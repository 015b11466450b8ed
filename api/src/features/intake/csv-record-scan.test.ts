import { Readable } from 'node:stream';
import { text } from 'node:stream/consumers';
import { describe, expect, it } from 'vitest';
import { CsvRecordScan } from './csv-record-scan';

/** Runs `body` through a scan in the given pieces; the bytes out, the records counted, or the error. */
async function scan(pieces: string[], refuse = true): Promise<{ out: string; records: number } | { error: string }> {
  const s = new CsvRecordScan(2, refuse);
  try {
    const out = await text(Readable.from(pieces.map((p) => Buffer.from(p))).pipe(s));
    return { out, records: s.records };
  } catch (err) {
    return { error: (err as Error).message };
  }
}

/** Every way of cutting `body` into two pieces. */
const cuts = (body: string) => Array.from({ length: body.length + 1 }, (_, i) => [body.slice(0, i), body.slice(i)]);

describe('CsvRecordScan', () => {
  it.each([
    ['LF rows', 'a,b\nc,d\n', 2],
    ['CRLF rows', 'a,b\r\nc,d\r\n', 2],
    ['CR rows', 'a,b\rc,d\r', 2],
    ['no final line end', 'a,b\nc,d', 2],
    ['a line end inside quotes', '"a\nb",c\nd,e\n', 2],
    ['doubled quotes', '"a""\n""b",c\n', 1],
    ['an empty line (a record COPY refuses)', 'a,b\n\nc,d\n', 3],
    ['\\. with more on its line', '\\.x,b\nc,\\.\n', 2],
  ])('counts records as COPY does: %s, whatever the chunking', async (_name, body, records) => {
    for (const pieces of cuts(body)) expect(await scan(pieces)).toEqual({ out: body, records });
  });

  it.each([
    ['alone on an LF line', 'a,b\n\\.\nc,d\n', 3],
    ['alone on a CRLF line', 'a,b\r\n\\.\r\nc,d\r\n', 3],
    ['as the last line', 'a,b\n\\.', 3],
    ['first', '\\.\na,b\n', 2],
    ['inside a quoted value', '"a\n\\.\nb",c\n', 3],
  ])('refuses a line holding only \\. %s, wherever the chunks break', async (_name, body, line) => {
    for (const pieces of cuts(body)) {
      const r = await scan(pieces);
      expect(r).toHaveProperty('error');
      expect((r as { error: string }).error).toMatch(new RegExp(`line ${line} holds only`));
    }
  });

  it('lets the marker through when told to (the row count then has to catch it)', async () => {
    expect(await scan(['a,b\n\\.\nc,d\n'], false)).toEqual({ out: 'a,b\n\\.\nc,d\n', records: 3 });
  });
});
