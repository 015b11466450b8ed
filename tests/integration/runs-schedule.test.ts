import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { readWorkerConfig } from '@ratewarden/worker/config';
import { nightlyRun } from '@ratewarden/worker/runs/nightly-run';
import { stopComputePool } from '@ratewarden/worker/runs/compute-pool';
import { startSchedule } from '@ratewarden/worker/schedule';
import { openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings } from './runs-fixture';

/** The nightly schedule: node-cron calls the tick, and one tick makes one run however many workers see it. */
describe('the nightly schedule', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    const c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['NIGHT', 'recurrent']],
    });
    const w = await c.worker('n1', 1980, 'M');
    await c.roster([[w, '2031-06-01', c.sites[0]!, c.groups.EXP!, 160]]);
  });
  afterAll(async () => {
    await stopComputePool();
    await ds.destroy();
  });

  it('calls the tick on the configured schedule (every second here; the default is 02:00 nightly)', async () => {
    expect(readWorkerConfig({}).RUN_SCHEDULE).toBe('0 2 * * *');
    const config = readWorkerConfig({ RUN_SCHEDULE: '* * * * * *', RUN_TIMEZONE: 'Europe/Berlin' });
    let ticks = 0;
    const task = startSchedule(config, async () => {
      ticks++;
    });
    try {
      const deadline = Date.now() + 5_000;
      while (ticks === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    } finally {
      await task.stop();
    }
    expect(ticks).toBeGreaterThan(0);
  });

  it('one tick seen by two workers gives one run; the other skips it', async () => {
    const config = readWorkerConfig({});
    const now = new Date();
    const [a, b] = await Promise.all([nightlyRun(ds, config, settings, now), nightlyRun(ds, config, settings, now)]);
    const outcomes = [a, b].map((o) => o.status).sort();
    expect(outcomes).toEqual(['skipped', 'succeeded']);
    const skipped = [a, b].find((o) => o.status === 'skipped') as { reason: string };
    expect(['busy', 'already ran']).toContain(skipped.reason);
    // A worker whose handler for the same tick comes after the run has finished finds it done.
    expect(await nightlyRun(ds, config, settings, now)).toMatchObject({ status: 'skipped', reason: 'already ran' });
    const runs = (await ds.query(`SELECT trigger, reason, state FROM runs WHERE trigger = 'schedule'`)) as Array<{
      trigger: string;
      reason: string;
      state: string;
    }>;
    expect(runs).toEqual([{ trigger: 'schedule', reason: 'nightly schedule', state: 'succeeded' }]);
  });
});
