import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { intakeDetailSchema, intakeUploadResponseSchema, type IntakeDiff } from '@ratewarden/shared/intake-schemas';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { makeCorner, type Corner } from './intake-support';

const rosterCsv = (rows: string[]) => `worker_key,site,exposure_group,month,hours,birth_year,sex\n${rows.join('\n')}\n`;
const casesCsv = (rows: string[]) => `case_ref,worker_key,outcome,onset_date,status\n${rows.join('\n')}\n`;

type CaseDiff = Extract<IntakeDiff, { kind: 'cases' }>;

/**
 * The case-list diff split by outcome × status × exposure group. A first list (applied) has three
 * suspected OB cases in GB; the second confirms them (changed) and brings new ones: OB 20
 * confirmed in GA, 9 confirmed and 2 suspected in GB; OA 7 confirmed in GA; OC (one-month lag) 6
 * confirmed in March, the first rostered month, so no roster row attributes them ("not rostered").
 */
describe('case-list diff split by outcome, status and exposure group', () => {
  let ds: DataSource;
  let c: Corner;
  let OC: string;
  let app: ReturnType<typeof createApp>;
  const as = {} as Record<'hygienist' | 'physician', SignedInAgent>;

  const upload = (kind: 'roster' | 'cases', body: string, mode: 'check' | 'apply') =>
    as.hygienist.agent
      .post(`/api/intakes?kind=${kind}&mode=${mode}`)
      .set('x-csrf-token', as.hygienist.csrf)
      .attach('file', Buffer.from(c.fill(body)), { filename: `${kind}.csv`, contentType: 'text/csv' });

  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    OC = `OC${c.tag}`;
    await ds.query(`INSERT INTO outcomes (code, name, case_definition, counting_rule, lag_months) VALUES ($1, 'Outcome C (lagged)', 'test', 'recurrent', 1)`, [
      OC,
    ]);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', c.siteIds);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as.hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    as.physician = await signIn(app, 'physician@demo.ratewarden.test');
    // March 2024 (the corner's first rostered month): ten workers in GA, ten in GB.
    const rows = [...Array(10).keys()].flatMap((i) => [`{W}A${i},{S1},{GA},2024-03,160,1980,F`, `{W}B${i},{S1},{GB},2024-03,160,1981,M`]);
    await upload('roster', rosterCsv(rows), 'apply').expect(201);
    await upload('cases', casesCsv([0, 1, 2].map((i) => `{W}X${i},{W}B${i},{OB},2024-03-0${i + 1},suspected`)), 'apply').expect(201);
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('the physician gets every count; the hygienist gets small ones withheld, with what would give them back', async () => {
    const day = (n: number) => `2024-03-${String(n + 1).padStart(2, '0')}`;
    const lines = [
      ...[0, 1, 2].map((i) => `{W}X${i},{W}B${i},{OB},2024-03-0${i + 1},confirmed`),
      ...[...Array(20).keys()].map((n) => `{W}GA${n},{W}A${n % 10},{OB},${day(10 + Math.floor(n / 10))},confirmed`),
      ...[...Array(9).keys()].map((n) => `{W}GB${n},{W}B${n},{OB},${day(20)},confirmed`),
      ...[0, 1].map((n) => `{W}GS${n},{W}B${n},{OB},${day(25)},suspected`),
      ...[...Array(7).keys()].map((n) => `{W}FA${n},{W}A${n},{OA},${day(5)},confirmed`),
      ...[...Array(6).keys()].map((n) => `{W}LC${n},{W}A${n},${OC},${day(7)},confirmed`),
    ];
    const res = await upload('cases', casesCsv(lines), 'check').expect(201);
    const { intake } = intakeUploadResponseSchema.parse(res.body);
    expect(intake.state).toBe('checked');

    const { codes } = c;
    const diffOf = async (who: SignedInAgent) => intakeDetailSchema.parse((await who.agent.get(`/api/intakes/${intake.id}`).expect(200)).body).diff as CaseDiff;
    const shown = (count: number) => ({ count, withheld: null });
    const physician = await diffOf(as.physician);
    // Totals by hand: new 20 + 9 + 2 + 7 + 6 = 44, changed 3 (the suspected ones confirmed).
    expect(physician).toMatchObject({ kind: 'cases', new: 44, changed: 3, unchanged: 0 });
    expect(physician.byOutcome).toEqual([
      { outcomeCode: codes.OA, new: 7, changed: 0, newWithheld: null, changedWithheld: null },
      { outcomeCode: codes.OB, new: 31, changed: 3, newWithheld: null, changedWithheld: null },
      { outcomeCode: OC, new: 6, changed: 0, newWithheld: null, changedWithheld: null },
    ]);
    expect(physician.split).toEqual([
      { outcomeCode: codes.OA, status: 'confirmed', groupCode: codes.GA, new: shown(7), changed: shown(0) },
      { outcomeCode: codes.OB, status: 'confirmed', groupCode: codes.GA, new: shown(20), changed: shown(0) },
      { outcomeCode: codes.OB, status: 'confirmed', groupCode: codes.GB, new: shown(9), changed: shown(3) },
      { outcomeCode: codes.OB, status: 'suspected', groupCode: codes.GB, new: shown(2), changed: shown(0) },
      { outcomeCode: OC, status: 'confirmed', groupCode: null, new: shown(6), changed: shown(0) },
    ]);

    // The hygienist (and the upload answer they got): OB's new 2 is small and 9 its complement (with 31 shown,
    // 2 + 9 = 11 lets the 2 be anything from 1 to 4); changed: OB's 3 is small, a total withheld with its parts.
    const total = { count: null, withheld: 'total' };
    for (const hygienist of [await diffOf(as.hygienist), intake.diff as CaseDiff]) {
      expect(hygienist).toMatchObject({ new: 44, changed: 3, unchanged: 0 });
      expect(hygienist.byOutcome).toEqual([
        { outcomeCode: codes.OA, new: 7, changed: 0, newWithheld: null, changedWithheld: null },
        { outcomeCode: codes.OB, new: 31, changed: null, newWithheld: null, changedWithheld: 'small' },
        { outcomeCode: OC, new: 6, changed: 0, newWithheld: null, changedWithheld: null },
      ]);
      expect(hygienist.split).toEqual([
        { outcomeCode: codes.OA, status: 'confirmed', groupCode: codes.GA, new: shown(7), changed: shown(0) },
        { outcomeCode: codes.OB, status: 'confirmed', groupCode: codes.GA, new: shown(20), changed: total },
        { outcomeCode: codes.OB, status: 'confirmed', groupCode: codes.GB, new: { count: null, withheld: 'complement' }, changed: total },
        { outcomeCode: codes.OB, status: 'suspected', groupCode: codes.GB, new: { count: null, withheld: 'small' }, changed: total },
        { outcomeCode: OC, status: 'confirmed', groupCode: null, new: shown(6), changed: shown(0) },
      ]);
    }
  });
});
