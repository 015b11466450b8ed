import { Readable } from 'node:stream';
import type { PoolClient } from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { caseColumns } from '@ratewarden/shared/intake-columns';
import { copyRows, createStagingTable, stagingRef } from '@ratewarden/api/features/intake/copy-stage';
import { CsvRecordScan } from '@ratewarden/api/features/intake/csv-record-scan';
import { openTestDataSource } from '../support/test-db';
import { makeCorner, type Corner } from './intake-support';

const CASES_HEADER = 'case_ref,worker_key,outcome,onset_date,status';

/**
 * COPY's own escapes in uploaded files. A case list goes to COPY (FORMAT csv) as it arrives, and
 * there a line holding only `\.` is the end-of-data marker: the rows after it used to vanish while
 * the intake said checked. Now such a line is refused with its line number, and the rows staged
 * must equal the rows read. Rosters go to COPY as text written by the stream, every value escaped.
 */
describe('COPY escapes in intake files', () => {
  let ds: DataSource;
  let c: Corner;
  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    const roster = ['worker_key,site,exposure_group,month,hours,birth_year,sex', ...[1, 2, 3, 4].map((i) => `{W}00${i},{S1},{GA},2024-01,160,1980,F`)].join(
      '\n',
    );
    expect((await c.upload('roster', `${roster}\n`, { mode: 'apply' })).intake.state).toBe('applied');
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  const cases = (lines: string[], eol = '\n') => c.fill([CASES_HEADER, ...lines].join(eol) + eol);
  const caseRow = (i: number) => `E${i}{W},{W}00${i},{OA},2024-01-1${i},confirmed`;

  it('refuses a case list with a line holding only \\. and names the line, staging nothing', async () => {
    for (const eol of ['\n', '\r\n']) {
      const { intake } = await c.upload('cases', cases([caseRow(1), '\\.', caseRow(2), caseRow(3)], eol));
      expect(intake.state).toBe('rejected');
      expect(intake.rowCount).toBe(0);
      expect(intake.problems).toHaveLength(1);
      expect(intake.problems[0]).toMatchObject({ line: 3, column: null });
      expect(intake.problems[0]!.reason).toMatch(/^line 3 holds only \\\. /);
    }
    // As the last line, and inside a quoted value (COPY stops there too).
    const last = (await c.upload('cases', cases([caseRow(1), caseRow(2), '\\.']))).intake;
    expect(last.problems[0]).toMatchObject({ line: 4 });
    const quoted = (await c.upload('cases', cases([caseRow(1), `"E2\n\\.\n",{W}002,{OA},2024-01-12,confirmed`, caseRow(3)]))).intake;
    expect(quoted.problems[0]).toMatchObject({ line: 4 });
    expect(await ds.query(`SELECT count(*)::int AS n FROM case_events WHERE intake_id = ANY($1)`, [[last.id, quoted.id]])).toEqual([{ n: 0 }]);
  });

  it('takes \\. with more on its line, \\N and backslashes as text, judged like any other value', async () => {
    const ok = (await c.upload('cases', cases([caseRow(1), caseRow(2), caseRow(3)]))).intake;
    expect(ok).toMatchObject({ state: 'checked', rowCount: 3 });
    const odd = (
      await c.upload(
        'cases',
        cases([caseRow(1), '\\.x,{W}002,{OA},2024-01-12,confirmed', `E3{W},{W}003,{OA},2024-01-13,\\N`, `E\\4{W},{W}004,{OA},2024-01-14,confirmed`]),
      )
    ).intake;
    expect(odd.rowCount).toBe(4);
    expect(odd.problems.map((p) => [p.line, p.column, p.value])).toEqual([
      [3, 'case_ref', '\\.x'],
      [4, 'status', '\\N'],
      [5, 'case_ref', `E\\4${c.codes.W}`],
    ]);
  });

  it('names the line of a zero byte, and of a carriage return outside quotes', async () => {
    const nul = (await c.upload('cases', Buffer.from(cases([caseRow(1), `E2{W},{W}002,{OA},2024-01-12,conf\0irmed`])))).intake;
    expect(nul.problems[0]).toMatchObject({ line: 3 });
    expect(nul.problems[0]!.reason).toMatch(/zero byte/);
    const cr = (await c.upload('cases', cases([caseRow(1), `E2{W},{W}002,{OA},2024-01-12,con\rfirmed`]))).intake;
    expect(cr.problems[0]).toMatchObject({ line: 3 });
    expect(cr.problems[0]!.reason).toMatch(/line endings are mixed/);
  });

  it('refuses the intake when COPY stages fewer rows than the file holds', async () => {
    // The line scan with the marker check turned off: COPY then stops at \. and the count catches it.
    const qr = ds.createQueryRunner();
    const client = (await qr.connect()) as PoolClient;
    await qr.startTransaction();
    try {
      const table = `s_${'ab'.repeat(16)}`;
      await createStagingTable(client, table, caseColumns);
      const body = Buffer.from(c.fill(`${caseRow(1)}\n\\.\n${caseRow(2)}\n${caseRow(3)}\n`));
      const run = copyRows(
        client,
        table,
        caseColumns.map((d) => d.name),
        ',',
        Buffer.alloc(0),
        Readable.from([body]),
        new CsvRecordScan(2, false),
      );
      await expect(run).rejects.toMatchObject({
        code: 'validation_failed',
        details: {
          problems: [
            { line: null, reason: 'the file holds 4 data rows but 1 reached the staging table; nothing was taken in, so that no row is dropped silently' },
          ],
        },
      });
      // Counted the way COPY counts: quoted line ends inside a value, CRLF once, no final line end.
      await client.query(`TRUNCATE ${stagingRef(table)}`);
      const fine = Buffer.from(c.fill(`"E1{W}\r\nx",{W}001,{OA},2024-01-11,confirmed\r\n${caseRow(2)}\r\n${caseRow(3)}`));
      expect(
        await copyRows(
          client,
          table,
          caseColumns.map((d) => d.name),
          ',',
          Buffer.alloc(0),
          Readable.from([fine.subarray(0, 7), fine.subarray(7)]),
        ),
      ).toBe(3);
    } finally {
      await qr.rollbackTransaction();
      await qr.release();
    }
  });

  it('stores roster text with backslashes, \\N, \\. and tabs exactly as written', async () => {
    const titles = ['\\N', '\\.', 'a\\tb', 'back\\slash\\', 'tab\there', 'two\nlines'];
    const csv = [
      'worker_key,site,exposure_group,month,hours,birth_year,sex,job_title',
      ...titles.map((t, i) => `{W}1${i},{S2},{GB},2024-03,100,1970,M,"${t}"`),
      '\\.',
      '{W}19,{S2},{GB},2024-03,100,1970,M,x',
    ].join('\n');
    // The lone \. line of a roster is a row with too few fields, named by its line.
    const bad = (await c.upload('roster', `${csv}\n`)).intake;
    expect(bad.state).toBe('rejected');
    expect(bad.problems[0]!.reason).toMatch(/fewer fields than the header \(line 9\)/);
    const good = (await c.upload('roster', `${csv.split('\n\\.\n')[0]}\n`, { mode: 'apply' })).intake;
    expect(good).toMatchObject({ state: 'applied', rowCount: titles.length });
    const stored = (await ds.query(
      `SELECT w.worker_key, re.job_title FROM roster_entries re JOIN workers w ON w.id = re.worker_id WHERE re.intake_id = $1 ORDER BY w.worker_key`,
      [good.id],
    )) as Array<{ job_title: string }>;
    expect(stored.map((r) => r.job_title)).toEqual(titles);
  });
});
