import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { translateCopyError } from '@ratewarden/api/features/intake/copy-errors';
import { cellCheckSql } from '@ratewarden/api/features/intake/sql-checks';
import { cellJudge, monthOf } from '@ratewarden/shared/intake-cell';
import { caseColumns, reasons, rosterColumns } from '@ratewarden/shared/intake-columns';
import { rowSchema } from '@ratewarden/shared/intake-schemas';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { makeCorner, type Corner } from './intake-support';

const ROSTER = 'worker_key,site,exposure_group,month,hours,birth_year,sex';
const CASES = 'case_ref,worker_key,outcome,onset_date,status';

/** The month after `m` (YYYY-MM). */
function nextMonth(m: string): string {
  const [y, mo] = m.split('-').map(Number) as [number, number];
  return mo === 12 ? `${y + 1}-01` : `${y}-${String(mo + 1).padStart(2, '0')}`;
}

/**
 * Months and onset dates in a plausible range. Year 0000 used to reach PostgreSQL's date cast and
 * answer 500 (22008); now every bound is a cell rule (shared/intake-columns.ts) with line and
 * column, and months after the current one are refused unless INTAKE_ALLOW_FUTURE_MONTHS=1.
 */
describe('month and date bounds of intake files', () => {
  let ds: DataSource;
  let c: Corner;
  const june = new Date('2025-06-15T12:00:00Z');
  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('refuses year 0000 and months before 1950 in a roster, by line and column', async () => {
    const { intake } = await c.upload(
      'roster',
      `${ROSTER}\n{W}1,{S1},{GA},0000-01,160,1980,F\n{W}2,{S1},{GA},1949-12,160,1980,F\n{W}3,{S1},{GA},1950-01,160,1980,F\n`,
      { now: june },
    );
    expect(intake.state).toBe('rejected');
    expect(intake.problems).toEqual([
      { line: 2, column: 'month', value: '0000-01', reason: 'month must be between 1950-01 and 2099-12' },
      { line: 3, column: 'month', value: '1949-12', reason: 'month must be between 1950-01 and 2099-12' },
    ]);
  });

  it('refuses months after the current one unless future months are allowed', async () => {
    const body = `${ROSTER}\n{W}4,{S1},{GA},2025-06,160,1980,F\n{W}5,{S1},{GA},2025-07,160,1980,F\n{W}6,{S1},{GA},9999-12,160,1980,F\n`;
    const refused = (await c.upload('roster', body, { now: june })).intake;
    expect(refused.problems.map((p) => [p.line, p.column, p.reason])).toEqual([
      [3, 'month', reasons.future('month', '2025-06')],
      [4, 'month', 'month must be between 1950-01 and 2099-12'],
    ]);
    const allowed = (await c.upload('roster', body.replace('9999-12', '2099-12'), { now: june, allowFutureMonths: true })).intake;
    expect(allowed).toMatchObject({ state: 'checked', problemCount: 0, monthTo: '2099-12' });
  });

  describe('case lists', () => {
    beforeAll(async () => {
      const roster = `${ROSTER}\n{W}10,{S1},{GA},1950-01,160,1930,F\n{W}10,{S1},{GA},2025-06,160,1930,F\n{W}10,{S1},{GA},2025-07,160,1930,F\n`;
      expect((await c.upload('roster', roster, { mode: 'apply', allowFutureMonths: true })).intake.state).toBe('applied');
    });

    it('refuses onset year 0000 and dates before 1900 by line and column instead of failing', async () => {
      const { intake } = await c.upload(
        'cases',
        `${CASES}\nK1{W},{W}10,{OA},0000-01-01,confirmed\nK2{W},{W}10,{OA},1899-12-31,confirmed\nK3{W},{W}10,{OA},0000-02-30,confirmed\n`,
        { now: june },
      );
      expect(intake.state).toBe('rejected');
      expect(intake.problems.map((p) => [p.line, p.column, p.reason])).toEqual([
        [2, 'onset_date', 'onset_date must be between 1900-01-01 and 2099-12-31'],
        [3, 'onset_date', 'onset_date must be between 1900-01-01 and 2099-12-31'],
        [4, 'onset_date', 'onset_date must be between 1900-01-01 and 2099-12-31'],
      ]);
    });

    it('refuses onset dates after the current month unless future months are allowed', async () => {
      const body = `${CASES}\nK4{W},{W}10,{OA},2025-06-30,confirmed\nK5{W},{W}10,{OB},2025-07-01,confirmed\n`;
      const refused = (await c.upload('cases', body, { now: june })).intake;
      expect(refused.problems).toEqual([{ line: 3, column: 'onset_date', value: '2025-07-01', reason: reasons.future('onset_date', '2025-06') }]);
      expect((await c.upload('cases', body, { now: june, allowFutureMonths: true })).intake).toMatchObject({ state: 'checked', problemCount: 0 });
    });
  });

  it('gives the same verdicts in the shared row schema', () => {
    const row = { worker_key: 'W1', site: 'NFD', exposure_group: 'OFFICE', hours: '1', birth_year: '1980', sex: 'F' };
    expect(rowSchema('roster').safeParse({ ...row, month: '0000-01' }).error!.issues[0]!.message).toBe('month must be between 1950-01 and 2099-12');
    expect(rowSchema('roster', { latestMonth: '2025-06' }).safeParse({ ...row, month: '2025-07' }).error!.issues[0]!.message).toBe(
      reasons.future('month', '2025-06'),
    );
    expect(rowSchema('roster', { latestMonth: '2025-06' }).safeParse({ ...row, month: '2025-06' }).success).toBe(true);
  });

  it('says the same in SQL (case lists) as in the shared judge (rosters, schemas), value by value', async () => {
    const month = rosterColumns.find((x) => x.name === 'month')!;
    const onset = caseColumns.find((x) => x.name === 'onset_date')!;
    const values = [
      '0000-01',
      '1949-12',
      '1950-01',
      '2025-06',
      '2025-07',
      '2099-12',
      '2100-01',
      '9999-12',
      '2025-13',
      '',
      ' 2025-06 ',
      '0000-01-01',
      '0000-02-30',
      '1899-12-31',
      '1900-01-01',
      '2024-02-29',
      '2023-02-29',
      '2025-06-30',
      '2025-07-01',
      '2099-12-31',
      '2100-01-01',
      '9999-12-31',
      '2025-06-31',
    ];
    for (const bounds of [{ latestMonth: '2025-06' }, { latestMonth: null }]) {
      for (const def of [month, onset]) {
        const judge = cellJudge(def, bounds);
        const sql = (await ds.query(
          `SELECT v, ${cellCheckSql('d', def, {}, bounds)} AS reason FROM unnest($1::text[]) AS d(${def.name}) CROSS JOIN LATERAL (SELECT d.${def.name} AS v) x`,
          [values],
        )) as Array<{ v: string; reason: string | null }>;
        expect(
          sql.map((r) => [r.v, r.reason]),
          `${def.name} ${bounds.latestMonth}`,
        ).toEqual(values.map((v) => [v, judge(v).reason]));
      }
    }
  });

  it('turns any other PostgreSQL data error of COPY into a problem of its line and column', () => {
    const err = translateCopyError({
      code: '22008',
      message: 'date/time field value out of range: "0000-01-01"',
      where: 'COPY s_x, line 3, column month: "0000-01-01"',
    });
    expect(err).toMatchObject({
      status: 422,
      details: {
        problems: [{ line: 4, column: 'month', reason: 'a value in column month cannot be stored (line 4): date/time field value out of range: "0000-01-01"' }],
      },
    });
    const numeric = translateCopyError({ code: '22003', message: 'numeric field overflow' });
    expect(numeric).toMatchObject({ status: 422, details: { problems: [{ line: null, column: null }] } });
  });

  describe('through the API', () => {
    let hyg: SignedInAgent;
    let future: SignedInAgent;
    const current = monthOf(new Date());
    const upload = (who: SignedInAgent, body: string, name: string) =>
      who.agent
        .post('/api/intakes?kind=roster&mode=check')
        .set('x-csrf-token', who.csrf)
        .attach('file', Buffer.from(c.fill(body)), { filename: name, contentType: 'text/csv' });
    beforeAll(async () => {
      await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
      hyg = await signIn(createApp({ dataSource: ds, config: testApiConfig() }), 'hygienist@demo.ratewarden.test');
      future = await signIn(createApp({ dataSource: ds, config: testApiConfig({ INTAKE_ALLOW_FUTURE_MONTHS: '1' }) }), 'hygienist@demo.ratewarden.test');
    });

    it('answers year 0000 with 422 and the line, never 500', async () => {
      const res = await upload(hyg, `${ROSTER}\n{W}20,{S2},{GA},0000-01,160,1980,F\n`, 'zero.csv').expect(422);
      expect(res.body.details.intake.problems).toEqual([{ line: 2, column: 'month', value: '0000-01', reason: 'month must be between 1950-01 and 2099-12' }]);
    });

    it('refuses next month by default and takes it with INTAKE_ALLOW_FUTURE_MONTHS=1', async () => {
      const body = `${ROSTER}\n{W}21,{S2},{GA},${nextMonth(current)},160,1980,F\n`;
      const res = await upload(hyg, body, 'next.csv').expect(422);
      expect(res.body.message).toBe(`the file was rejected: ${reasons.future('month', current)}`);
      const ok = await upload(future, body, 'next-allowed.csv').expect(201);
      expect(ok.body.intake).toMatchObject({ state: 'checked', monthTo: nextMonth(current) });
    });
  });
});
