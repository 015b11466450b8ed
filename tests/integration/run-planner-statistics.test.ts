import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings } from './runs-fixture';

/**
 * A run refreshes the planner statistics of the tables it aggregates when they are missing
 * (as after a bulk load nobody analyzed yet): without them the aggregation of a large roster
 * takes a bad plan (42 s instead of 1.3 s measured on the benchmark roster).
 */
describe('planner statistics before a run', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('uses the PostgreSQL defaults the unit test assumes (autovacuum_analyze_threshold 50, scale factor 0.1)', async () => {
    const [row] = (await ds.query(
      `SELECT current_setting('autovacuum_analyze_threshold') AS t, current_setting('autovacuum_analyze_scale_factor') AS s`,
    )) as Array<{ t: string; s: string }>;
    expect(Number(row!.t)).toBe(50);
    expect(Number(row!.s)).toBe(0.1);
  });

  it('analyzes a roster table whose statistics are gone, and says so in the run summary', async () => {
    const c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['OUT', 'recurrent']],
    });
    const w = await c.worker('p1', 1980, 'F');
    await c.roster([[w, '2031-01-01', c.sites[0]!, c.groups.EXP!, 160]]);
    await ds.query(`SELECT pg_stat_reset_single_table_counters('roster_entries'::regclass)`);
    const before = (await ds.query(`SELECT last_analyze FROM pg_stat_user_tables WHERE relname = 'roster_entries'`)) as Array<{ last_analyze: Date | null }>;
    expect(before[0]!.last_analyze).toBeNull();

    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(outcome.status).toBe('succeeded');
    const [run] = (await ds.query(`SELECT summary FROM runs WHERE id = $1`, [(outcome as { runId: string }).runId])) as Array<{
      summary: { analyzed: string[] };
    }>;
    expect(run!.summary.analyzed).toContain('roster_entries');
    const after = (await ds.query(`SELECT last_analyze FROM pg_stat_user_tables WHERE relname = 'roster_entries'`)) as Array<{ last_analyze: Date | null }>;
    expect(after[0]!.last_analyze).not.toBeNull();
  });
});
