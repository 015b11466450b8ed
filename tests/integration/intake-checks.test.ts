import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { reasons, rosterColumns } from '@ratewarden/shared/intake-columns';
import { rowSchema } from '@ratewarden/shared/intake-schemas';
import { openTestDataSource } from '../support/test-db';
import { currentRoster, makeCorner, type Corner } from './intake-support';

/**
 * Each check of the roster and case formats, with a small file from tests/fixtures/intake that
 * breaks it. Expected reasons are the shared wording (intake-columns.ts); lines count the header as 1.
 */
describe('intake checks (service level, real PostgreSQL)', () => {
  let ds: DataSource;
  let c: Corner;
  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  const rejected = async (kind: 'roster' | 'cases', fixture: string) => {
    const { intake, duplicate } = await c.upload(kind, c.fixture(fixture), { fileName: fixture });
    expect(duplicate).toBe(false);
    expect(intake.state).toBe('rejected');
    return intake;
  };

  it('accepts a valid roster (comma, LF, decimal comma in quotes) and reports the diff of new slices', async () => {
    const { intake } = await c.upload('roster', c.fixture('roster-valid.csv'));
    expect(intake.problems).toEqual([]);
    expect(intake.state).toBe('checked');
    expect(intake.rowCount).toBe(6);
    expect(intake.monthFrom).toBe('2024-01');
    expect(intake.monthTo).toBe('2024-02');
    expect(intake.siteIds).toEqual([c.siteIds[0]]);
    expect(intake.diff).toMatchObject({ kind: 'roster', newWorkers: 3, totals: { newSlices: 2, replacedSlices: 0, added: 6 } });
    // Hours by hand: January 160 + 150.5 + 120.25, February 158 + 149 + 0.
    const d = intake.diff as { slices: Array<{ month: string; newHours: number }> };
    expect(d.slices.map((s) => [s.month, s.newHours])).toEqual([
      ['2024-01', 430.75],
      ['2024-02', 307],
    ]);
    // Checked is not applied: nothing is current yet.
    expect(await currentRoster(ds, c.siteIds)).toEqual([]);
    const { intake: after } = await c.upload('roster', c.fixture('roster-valid.csv'));
    expect(after.id).toBe(intake.id);
  });

  it('names a missing required column', async () => {
    const i = await rejected('roster', 'roster-missing-column.csv');
    expect(i.problems).toEqual([{ line: 1, column: 'hours', value: null, reason: 'required column hours is missing from the header' }]);
  });

  it('names an unknown column', async () => {
    const i = await rejected('roster', 'roster-unknown-column.csv');
    expect(i.problems).toHaveLength(1);
    expect(i.problems[0]).toMatchObject({ line: 1, column: 'shoe_size' });
    expect(i.problems[0]!.reason).toMatch(/^unknown column "shoe_size"/);
  });

  it('reports malformed months and whole numbers per row and column', async () => {
    const i = await rejected('roster', 'roster-malformed-date.csv');
    const monthRule = rosterColumns.find((x) => x.name === 'month')!.rule;
    expect(i.problems).toEqual([
      { line: 2, column: 'month', value: '2024-13', reason: reasons.shape('month', monthRule) },
      { line: 3, column: 'month', value: '24-01', reason: reasons.shape('month', monthRule) },
      { line: 4, column: 'birth_year', value: 'nineteen', reason: 'birth_year is not a whole number' },
    ]);
  });

  it('reports malformed and empty hours', async () => {
    const i = await rejected('roster', 'roster-malformed-number.csv');
    expect(i.problems.map((p) => [p.line, p.column, p.reason])).toEqual([
      [2, 'hours', 'hours is not a number (use digits with at most 2 decimals)'],
      [3, 'hours', 'hours is not a number (use digits with at most 2 decimals)'],
      [4, 'hours', 'hours is empty'],
    ]);
  });

  it('reports unknown site and exposure group codes without creating them', async () => {
    const s = await rejected('roster', 'roster-unknown-site.csv');
    expect(s.problems).toEqual([{ line: 2, column: 'site', value: `NOPE${c.codes.W}`, reason: reasons.unknownCode('site', 'site') }]);
    const g = await rejected('roster', 'roster-unknown-group.csv');
    expect(g.problems).toEqual([{ line: 2, column: 'exposure_group', value: 'NOGROUP', reason: reasons.unknownCode('exposure_group', 'exposure_group') }]);
    expect(await ds.query(`SELECT 1 FROM exposure_groups WHERE code = 'NOGROUP'`)).toEqual([]);
  });

  it('keeps hours within 0 to 744 (744 itself is allowed: 31 days × 24 h)', async () => {
    const i = await rejected('roster', 'roster-hours-out-of-range.csv');
    expect(i.problems.map((p) => [p.line, p.value, p.reason])).toEqual([
      [2, '745', 'hours must be between 0 and 744'],
      [3, '-1', 'hours must be between 0 and 744'],
    ]);
  });

  it('finds a worker twice in one month, naming every row involved', async () => {
    const i = await rejected('roster', 'roster-worker-twice.csv');
    expect(i.problems).toEqual([
      { line: 2, column: 'month', value: '2024-01', reason: reasons.workerTwiceInMonth },
      { line: 3, column: 'month', value: '2024-01', reason: reasons.workerTwiceInMonth },
    ]);
  });

  it('reads CRLF line endings, a BOM, semicolons and a decimal comma; formula-looking text is kept as plain text', async () => {
    const crlf = await c.upload('roster', c.fixture('roster-crlf.csv').toString().replace('{W}001', `${c.codes.W}101`).replace('2024-01', '2023-01'));
    expect(crlf.intake.problems).toEqual([]);
    const { intake } = await c.upload('roster', c.fixture('roster-bom-semicolon-formula.csv').toString().replace('2024-01', '2023-06'), { mode: 'apply' });
    expect(intake.problems).toEqual([]);
    expect(intake.state).toBe('applied');
    const rows = await ds.query(`SELECT hours::text AS hours, job_title FROM roster_entries WHERE intake_id = $1`, [intake.id]);
    expect(rows).toEqual([{ hours: '80.50', job_title: "=cmd|'/C calc'!A0" }]);
  });

  it.each([
    ['empty.csv', /the file is empty/],
    ['roster-header-only.csv', /header row but no data rows/],
    ['binary-garbage.bin', /binary|not UTF-8|not a header row/],
    ['roster-latin1.csv', /not UTF-8 text \(line 2\)/],
    ['roster-short-row.csv', /fewer fields than the header \(line 3\)/],
  ])('rejects %s with a clear reason and stores no rows', async (fixture, reason) => {
    const i = await rejected('roster', fixture);
    expect(i.problems[0]!.reason).toMatch(reason);
    expect(await ds.query(`SELECT 1 FROM roster_entries WHERE intake_id = $1`, [i.id])).toEqual([]);
    const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM pg_tables WHERE schemaname = 'intake_staging' AND tablename = $1`, [
      `s_${i.id.replace(/-/g, '')}`,
    ]);
    expect(n).toBe(0);
  });

  it('refuses a file over the size limit with a 413 problem, storing nothing', async () => {
    const before = await ds.query(`SELECT count(*)::int AS n FROM intakes`);
    const big = Buffer.alloc(5000, 'x');
    await expect(c.upload('roster', big, { maxBytes: 4096 })).rejects.toMatchObject({ code: 'payload_too_large', status: 413 });
    expect(await ds.query(`SELECT count(*)::int AS n FROM intakes`)).toEqual(before);
  });

  describe('case lists', () => {
    beforeAll(async () => {
      const { intake } = await c.upload('roster', c.fixture('roster-valid.csv').toString().replace(/\n/, '\n').replace('150.5', '150.50'), { mode: 'apply' });
      expect(intake.state).toBe('applied');
    });

    it('accepts a valid case list and counts new cases', async () => {
      const { intake } = await c.upload('cases', c.fixture('cases-valid.csv'));
      expect(intake.problems).toEqual([]);
      expect(intake.diff).toEqual({
        kind: 'cases',
        new: 2,
        changed: 0,
        unchanged: 0,
        byOutcome: [
          { outcomeCode: c.codes.OA, new: 1, changed: 0, newWithheld: null, changedWithheld: null },
          { outcomeCode: c.codes.OB, new: 1, changed: 0, newWithheld: null, changedWithheld: null },
        ],
        // Each case in the group of its worker's roster row of the onset month (the service stores every count; the API withholds).
        split: [
          { outcomeCode: c.codes.OA, status: 'confirmed', groupCode: c.codes.GA, new: { count: 1, withheld: null }, changed: { count: 0, withheld: null } },
          { outcomeCode: c.codes.OB, status: 'suspected', groupCode: c.codes.GB, new: { count: 1, withheld: null }, changed: { count: 0, withheld: null } },
        ],
      });
    });

    it('reports impossible dates, other date formats, unknown outcomes and statuses', async () => {
      const i = await rejected('cases', 'cases-malformed.csv');
      expect(i.problems.map((p) => [p.line, p.column, p.reason])).toEqual([
        [2, 'onset_date', 'onset_date is not a day of the calendar'],
        [3, 'onset_date', 'onset_date is not a date written YYYY-MM-DD'],
        [4, 'outcome', reasons.unknownCode('outcome', 'outcome')],
        [4, 'status', 'status must be one of suspected, confirmed, ruled_out'],
      ]);
    });

    it('reports a case for a worker on no roster', async () => {
      const i = await rejected('cases', 'cases-worker-not-rostered.csv');
      expect(i.problems).toEqual([{ line: 2, column: 'worker_key', value: `${c.codes.W}999`, reason: reasons.caseWorkerNotRostered }]);
    });

    it('reports a case dated outside the worker’s rostered months', async () => {
      const i = await rejected('cases', 'cases-outside-roster.csv');
      expect(i.problems).toEqual([{ line: 2, column: 'onset_date', value: '2023-12-15', reason: reasons.caseOutsideRoster }]);
    });

    it('reports a case reference twice and a duplicate case event', async () => {
      const i = await rejected('cases', 'cases-duplicates.csv');
      expect(i.problems.map((p) => [p.line, p.column, p.reason])).toEqual([
        [2, 'case_ref', reasons.caseRefTwice],
        [2, 'case_ref', reasons.caseDuplicateEvent],
        [3, 'case_ref', reasons.caseRefTwice],
        [4, 'case_ref', reasons.caseDuplicateEvent],
      ]);
    });

    it('reports a case event stored under another reference, unless the file gives that reference another event', async () => {
      const header = 'case_ref,worker_key,outcome,onset_date,status\n';
      const stored = await c.upload('cases', `${header}D1{W},{W}003,{OA},2024-02-10,confirmed\n`, { mode: 'apply' });
      expect(stored.intake.state).toBe('applied');
      // The same worker, outcome and onset under a new reference: a duplicate of the stored case.
      const twice = await c.upload('cases', `${header}D2{W},{W}003,{OA},2024-02-10,suspected\n`);
      expect(twice.intake.state).toBe('rejected');
      expect(twice.intake.problems.map((p) => [p.line, p.column, p.reason])).toEqual([[2, 'case_ref', reasons.caseDuplicateEvent]]);
      // The stored reference moved to another day in the same file: the new reference may take the event.
      const moved = await c.upload('cases', `${header}D1{W},{W}003,{OA},2024-02-11,confirmed\nD2{W},{W}003,{OA},2024-02-10,suspected\n`);
      expect(moved.intake.problems).toEqual([]);
    });
  });

  it('derives the zod row schema from the same rules (same reasons as SQL)', () => {
    const schema = rowSchema('roster');
    const ok = schema.safeParse({ worker_key: 'W1', site: 'nfd', exposure_group: 'office', month: '2024-01', hours: '151,5', birth_year: '1980', sex: 'f' });
    expect(ok.success && ok.data).toEqual({
      worker_key: 'W1',
      site: 'NFD',
      exposure_group: 'OFFICE',
      month: '2024-01',
      hours: 151.5,
      birth_year: 1980,
      sex: 'F',
      job_title: null,
    });
    const bad = schema.safeParse({ worker_key: 'W1', site: 'NFD', exposure_group: 'X', month: '2024-13', hours: '745', birth_year: '1980', sex: 'F' });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.message).sort()).toEqual(
      ['hours must be between 0 and 744', reasons.shape('month', rosterColumns.find((x) => x.name === 'month')!.rule)].sort(),
    );
  });
});
