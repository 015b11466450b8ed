import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { periodCalendarSchema } from '@ratewarden/shared/period-calendar';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { monthCohort, type MonthCohort } from './periods-fixture';
import { clearCohortData } from './runs-fixture';

/**
 * The period calendar is kept per reader under the `periods` counter of data_versions: a reader
 * of one site never gets the calendar kept for a reader of every site (or the other way round),
 * and a month closed, a roster applied or a closure written straight in the database changes the
 * answer at once (no 304 for the old tag).
 */
describe('period calendar: kept per reader and data version', () => {
  let ds: DataSource;
  let c: MonthCohort;
  let north: SignedInAgent;
  const query = 'from=2026-09&to=2026-11';

  const calendar = async (who: SignedInAgent, ifNoneMatch?: string) => {
    const req = who.agent.get(`/api/periods?${query}`);
    const res = await (ifNoneMatch ? req.set('if-none-match', ifNoneMatch) : req);
    return { status: res.status, tag: res.headers.etag as string, cal: res.status === 200 ? periodCalendarSchema.parse(res.body) : null };
  };
  const state = (cal: ReturnType<typeof periodCalendarSchema.parse> | null, siteId: number, month: string) =>
    cal!.periods.find((p) => p.siteId === siteId && p.month === `${month}-01`)?.state;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    c = await monthCohort(ds, app, { historyMonths: ['2026-09', '2026-10'], withCases: false });
    await c.uploadCases([`${c.tag}-X1,${c.tag}-NE1,${c.codes.outcome},2026-09-03,confirmed`], '2026-09');
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', 'hygienist', [c.sites.north]);
    north = await signIn(app, 'newcomer@demo.ratewarden.test');
  });
  afterAll(async () => {
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', null);
    await ds?.destroy();
  });

  it("never gives a reader of one site the calendar kept for every site's reader, whoever asks first", async () => {
    for (let round = 0; round < 2; round++) {
      const all = await calendar(c.hygienist);
      const one = await calendar(north);
      expect(all.cal!.sites.map((s) => s.id)).toEqual(expect.arrayContaining([c.sites.north, c.sites.south]));
      expect(one.cal!.sites.map((s) => s.id)).toEqual([c.sites.north]);
      expect(new Set(one.cal!.periods.map((p) => p.siteId))).toEqual(new Set([c.sites.north]));
      expect(one.tag).not.toBe(all.tag);
      expect((await calendar(north, one.tag)).status).toBe(304);
      expect((await calendar(north, all.tag)).status).toBe(200);
    }
  });

  it('changes at once when a month is closed, a roster applied, or a closure written elsewhere', async () => {
    const before = await calendar(north);
    expect(state(before.cal, c.sites.north, '2026-09')).toBe('ready');
    await north.agent.post('/api/periods/close').set('x-csrf-token', north.csrf).send({ siteId: c.sites.north, month: '2026-09' }).expect(200);
    const closed = await calendar(north, before.tag);
    expect(closed.status).toBe(200);
    expect(state(closed.cal, c.sites.north, '2026-09')).toBe('closed');
    // The reader of every site sees it too, though their calendar was kept before the closing.
    expect(state((await calendar(c.hygienist)).cal, c.sites.north, '2026-09')).toBe('closed');

    expect(state(closed.cal, c.sites.north, '2026-11')).toBe('awaiting');
    expect((await c.newMonthRoster()).state).toBe('applied');
    expect(state((await calendar(north)).cal, c.sites.north, '2026-11')).not.toBe('awaiting');

    // A reopening written by another process (or a script) straight into the table.
    await ds.query(`INSERT INTO period_closures (site_id, month, action, reason) VALUES ($1, '2026-09-01', 'reopen', 'written elsewhere')`, [c.sites.north]);
    expect(state((await calendar(north)).cal, c.sites.north, '2026-09')).not.toBe('closed');
  });
});
