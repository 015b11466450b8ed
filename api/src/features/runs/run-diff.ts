import type { DataSource } from 'typeorm';
import type { StoredResult } from '@ratewarden/db/run-results';
import type { RunDiff } from '@ratewarden/shared/runs';
import { resultScope } from '../../disclosure/result-scope';
import { runFrame } from '../../disclosure/run-frame';
import { n, withheldOf, type ResultReader } from './result-reader';
import { getRun, summaryPart } from './runs-service';

/** One run's side of a result cell in the diff below: its figures, null where the run has no row for the cell. */
type DiffSide<P extends 'a' | 'b'> = Record<`${P}_cases` | `${P}_ref_cases`, StoredResult['cases'] | null> &
  Record<`${P}_hours`, StoredResult['hours'] | null> &
  Record<`${P}_rate` | `${P}_irr`, StoredResult['rate'] | null> &
  Record<`${P}_ref_group`, StoredResult['reference_group_id']>;

/** A result cell of two runs side by side, as diffRuns reads it: the cell's key (period as YYYY-MM-DD), each side, and what changed. */
type DiffRow = Pick<StoredResult, 'outcome_id' | 'exposure_group_id' | 'window_kind' | 'period'> &
  DiffSide<'a'> &
  DiffSide<'b'> & { added: boolean; removed: boolean; changed: boolean };

/**
 * What changed between two runs: every result cell (outcome × group × window × period) added,
 * removed, or with different cases, hours, rate or IRR, in the reader's scope (as listResults).
 * Restated numbers are never overwritten, so both sides are read as they were stored. For readers
 * other than the physician the later run is the current one, its side withheld as in the results
 * (a count with its rate and IRR), and the earlier side's figures are withheld ('earlier').
 */
export async function diffRuns(ds: DataSource, fromId: string, toId: string, siteIdAsked: number | undefined, reader: ResultReader): Promise<RunDiff> {
  const [from, to] = [await getRun(ds, fromId), await getRun(ds, toId)];
  const siteId = await resultScope(ds, reader.principal, siteIdAsked);
  const rows: DiffRow[] = await ds.query(
    `WITH scoped AS (
            SELECT r.*, ref.cases AS ref_cases
            FROM run_results r
            LEFT JOIN run_results ref ON ref.run_id = r.run_id AND ref.site_id IS NOT DISTINCT FROM r.site_id AND ref.outcome_id = r.outcome_id
              AND ref.exposure_group_id = r.reference_group_id AND ref.window_kind = r.window_kind AND ref.period = r.period AND NOT r.is_reference
            WHERE r.run_id IN ($1, $2) AND r.site_id IS NOT DISTINCT FROM $3::int),
          a AS (SELECT * FROM scoped WHERE run_id = $1),
          b AS (SELECT * FROM scoped WHERE run_id = $2)
     SELECT coalesce(a.outcome_id, b.outcome_id) AS outcome_id, coalesce(a.exposure_group_id, b.exposure_group_id) AS exposure_group_id,
            coalesce(a.window_kind, b.window_kind) AS window_kind, to_char(coalesce(a.period, b.period), 'YYYY-MM-DD') AS period,
            a.cases AS a_cases, a.hours::text AS a_hours, a.rate AS a_rate, a.irr AS a_irr, a.reference_group_id AS a_ref_group, a.ref_cases AS a_ref_cases,
            b.cases AS b_cases, b.hours::text AS b_hours, b.rate AS b_rate, b.irr AS b_irr, b.reference_group_id AS b_ref_group, b.ref_cases AS b_ref_cases,
            (a.run_id IS NULL) AS added, (b.run_id IS NULL) AS removed,
            (a.cases IS DISTINCT FROM b.cases OR a.hours IS DISTINCT FROM b.hours OR a.rate IS DISTINCT FROM b.rate OR a.irr IS DISTINCT FROM b.irr) AS changed
     FROM a FULL JOIN b USING (outcome_id, exposure_group_id, window_kind, period)
     ORDER BY 1, 2, 3, 4`,
    [fromId, toId, siteId],
  );
  // The reader's frame of the later run (which must be the current one for anyone but the
  // physician); the earlier run's figures are the physician's (see runFrame).
  const frame = await runFrame(ds, toId, reader.principal);
  const t = reader.smallCellThreshold;
  const side = (r: DiffRow, p: 'a' | 'b') => {
    // Both are NOT NULL in a stored result: null together where the run has no row for the cell.
    const [cases, hours] = [r[`${p}_cases`], r[`${p}_hours`]];
    if (cases === null || hours === null) return null;
    if (p === 'a' && frame !== null) return { cases: null, suppressed: true, withheld: 'earlier' as const, hours, rate: null, irr: null };
    const withheld = withheldOf(frame, cases, siteId, r.outcome_id, r.exposure_group_id, r.window_kind, r.period, t);
    const refGroup = r[`${p}_ref_group`];
    const refCases = r[`${p}_ref_cases`];
    const refWithheld =
      refGroup !== null && refCases !== null && withheldOf(frame, refCases, siteId, r.outcome_id, refGroup, r.window_kind, r.period, t) !== null;
    // The IRR is withheld with the count: with the reference row it would give the count back; and
    // with the reference count: with the group's rate it would give that back.
    return withheld
      ? { cases: null, suppressed: true, withheld, hours, rate: null, irr: null }
      : { cases, suppressed: false, withheld, hours, rate: n(r[`${p}_rate`]), irr: refWithheld ? null : n(r[`${p}_irr`]) };
  };
  const changed = rows.filter((r) => r.changed);
  return {
    from: summaryPart(from),
    to: summaryPart(to),
    settingsChanged: JSON.stringify(from.settings) !== JSON.stringify(to.settings) || from.codeVersion !== to.codeVersion,
    unchangedCount: rows.length - changed.length,
    rows: changed.map((r) => ({
      outcomeId: r.outcome_id,
      exposureGroupId: r.exposure_group_id,
      window: r.window_kind,
      period: r.period,
      change: r.added ? 'added' : r.removed ? 'removed' : 'changed',
      before: side(r, 'a'),
      after: side(r, 'b'),
    })),
  };
}
