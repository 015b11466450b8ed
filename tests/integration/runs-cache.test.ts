import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { runPeriodIndexSchema } from '@ratewarden/shared/runs';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * Run figures are cached per run: an ETag that changes with the current run and with who asks,
 * `private, no-cache`, and 304 for a matching If-None-Match; never a stale answer once another
 * run is current (a reader other than the physician then gets 403 for the old run).
 */
describe('run reads: conditional requests per run and reader', () => {
  let ds: DataSource;
  let c: Cohort;
  let hygienist: SignedInAgent;
  let safety: SignedInAgent;
  let firstRun: string;

  const run = async () => {
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    if (o.status !== 'succeeded') throw new Error(`run ${o.status}`);
    return o.runId;
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['CAC', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    for (let i = 0; i < 10; i++) {
      rows.push([await c.worker(`e${i}`, 1980, 'M'), '2031-12-01', c.sites[0]!, c.groups.EXP!, 160]);
      rows.push([await c.worker(`r${i}`, 1980, 'F'), '2031-12-01', c.sites[0]!, c.groups.REF!, 160]);
    }
    await c.roster(rows);
    firstRun = await run();
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [c.sites[0]!]);
    hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    safety = await signIn(app, 'safety@demo.ratewarden.test');
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('gives a page its periods first, then the figures of one period only', async () => {
    const index = await hygienist.agent.get(`/api/runs/${firstRun}/periods?outcomeId=${c.outcomes.CAC}&window=month`).expect(200);
    expect(runPeriodIndexSchema.parse(index.body)).toEqual({
      window: 'month',
      // One month of data, whose roster and case list are both in (the fixture's case list reports through it); no group withheld.
      periods: [{ period: '2031-12-01', completeness: 'complete', everyGroupShown: true, someGroupShown: true }],
    });
    const all = await hygienist.agent.get(`/api/runs/${firstRun}/results?outcomeId=${c.outcomes.CAC}`).expect(200);
    const one = await hygienist.agent.get(`/api/runs/${firstRun}/results?outcomeId=${c.outcomes.CAC}&window=month&from=2031-12-01&to=2031-12-01`).expect(200);
    expect(one.body.length).toBe(2);
    expect(one.body.every((r: { window: string; period: string }) => r.window === 'month' && r.period === '2031-12-01')).toBe(true);
    expect(all.body.length).toBeGreaterThan(one.body.length);
    // A reader of one site gets that site's periods, and the company's are refused as its figures are.
    await safety.agent.get(`/api/runs/${firstRun}/periods?outcomeId=${c.outcomes.CAC}&window=month`).expect(403);
    await safety.agent.get(`/api/runs/${firstRun}/periods?outcomeId=${c.outcomes.CAC}&window=month&siteId=${c.sites[0]}`).expect(200);
  });

  it('answers 304 to a matching If-None-Match, with an ETag per reader, and a new one after the next run', async () => {
    const url = `/api/runs/${firstRun}/results?outcomeId=${c.outcomes.CAC}`;
    const first = await hygienist.agent.get(url).expect(200);
    const tag = first.headers.etag as string;
    expect(tag).toMatch(/^"run-/);
    expect(first.headers['cache-control']).toBe('private, no-cache');
    expect(first.body.length).toBeGreaterThan(0);

    const again = await hygienist.agent.get(url).set('if-none-match', tag).expect(304);
    expect(again.text).toBe('');

    // Another reader (one site) asking for that site's rows gets a tag of their own.
    const siteUrl = `/api/runs/${firstRun}/results?outcomeId=${c.outcomes.CAC}&siteId=${c.sites[0]}`;
    const theirs = await safety.agent.get(siteUrl).expect(200);
    expect(theirs.headers.etag).not.toBe(tag);
    await safety.agent.get(siteUrl).set('if-none-match', tag).expect(200);

    // A new current run: the old tag no longer matches, and the old run is the physician's alone.
    await run();
    await hygienist.agent.get(url).set('if-none-match', tag).expect(403);
    const current = await hygienist.agent.get('/api/runs/current').expect(200);
    await hygienist.agent
      .get('/api/runs/current')
      .set('if-none-match', current.headers.etag as string)
      .expect(304);
  });

  it('keeps an answer ready to send, gzipped or not as asked, and never serves it once another run is current', async () => {
    const url = '/api/runs/current';
    const before = await hygienist.agent.get(url).set('accept-encoding', 'gzip').expect(200);
    expect(before.headers['content-encoding']).toBe('gzip');
    expect(before.headers['content-type']).toMatch(/^application\/json/);
    const plain = await hygienist.agent.get(url).set('accept-encoding', 'identity').expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body).toEqual(before.body);
    expect(plain.headers.etag).toBe(before.headers.etag);

    const next = await run();
    const after = await hygienist.agent.get(url).expect(200);
    expect(before.body.id).not.toBe(next);
    expect(after.body.id).toBe(next);
    expect(after.headers.etag).not.toBe(before.headers.etag);
  });
});
