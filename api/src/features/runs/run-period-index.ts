import type { DataSource } from 'typeorm';
import type { StoredResult } from '@ratewarden/db/run-results';
import type { RunPeriodIndex, RunPeriodIndexQuery } from '@ratewarden/shared/runs';
import { runFrame, withheldCount } from '../../disclosure/run-frame';
import { completenessOf, runPeriodBook, runWindowContext } from './run-periods';
import { resultScope } from '../../disclosure/result-scope';
import type { ResultReader } from './result-reader';
import { getRun } from './runs-service';

/**
 * The periods of one outcome's window in the reader's scope, with completeness and what the reader
 * sees of them (shared/src/runs.ts, runPeriodIndexSchema): read from the counts alone, so a page
 * picks its period before it asks for the figures of that period only.
 */
export async function runPeriodIndex(ds: DataSource, runId: string, q: RunPeriodIndexQuery, reader: ResultReader): Promise<RunPeriodIndex> {
  const run = await getRun(ds, runId);
  const siteId = await resultScope(ds, reader.principal, q.siteId);
  const frame = await runFrame(ds, runId, reader.principal, q.outcomeId);
  const rows: Array<Pick<StoredResult, 'period' | 'exposure_group_id' | 'cases'>> = await ds.query(
    `SELECT to_char(period, 'YYYY-MM-DD') AS period, exposure_group_id, cases FROM run_results
     WHERE run_id = $1 AND site_id IS NOT DISTINCT FROM $2::int AND outcome_id = $3 AND window_kind = $4
     ORDER BY period DESC`,
    [runId, siteId, q.outcomeId, q.window],
  );
  const completeness = completenessOf(await runPeriodBook(ds, runId), runWindowContext(run));
  const byPeriod = new Map<string, Array<ReturnType<typeof withheldCount>>>();
  for (const r of rows) {
    const w = withheldCount(frame, r.cases, reader.smallCellThreshold, siteId, q.outcomeId, r.exposure_group_id, q.window, r.period);
    const list = byPeriod.get(r.period);
    if (list) list.push(w);
    else byPeriod.set(r.period, [w]);
  }
  return {
    window: q.window,
    periods: [...byPeriod].map(([period, withheld]) => ({
      period,
      completeness: completeness(q.window, period, siteId),
      everyGroupShown: withheld.every((w) => w !== 'months'),
      someGroupShown: withheld.some((w) => w === null),
    })),
  };
}
