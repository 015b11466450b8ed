import type { QueryRunner } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';

/**
 * The one set-wise aggregation of a run: cases and hours per outcome × month × site × exposure
 * group × age band × sex, over the current roster (rows whose intake holds their site × month in
 * `roster_slices`) and the current case events (not superseded) with a counted status.
 *
 * - Exposure lag L: the hours and exposure group of roster month m are credited to month m + L,
 *   and a case with onset in month c is attributed to the worker's roster row of month c − L.
 *   Shifted months beyond the last roster month are cut, since no cases can be known there yet.
 * - First event only: a worker's first counted case of the outcome is the only one counted, and
 *   their person-time after the month of that case leaves the at-risk time of the outcome. The
 *   onset month itself is kept whole because hours are known per month only.
 * - A case is attributed to one roster row with hours (the one with most hours when a worker is
 *   on two sites' rosters in a month); a case with no such row matches no cell and is counted
 *   apart as unattributed.
 * - Age band: 10-year bands of (calendar year of the month − birth year); null when unknown.
 */
const CTES = `
  o AS (
    SELECT id AS outcome_id, lag_months, counting_rule = 'first_event' AS first_only FROM outcomes
  ),
  last_month AS (SELECT max(month) AS month FROM roster_slices),
  cur AS (
    SELECT r.worker_id, r.month, r.site_id, r.exposure_group_id, r.hours, w.birth_year, w.sex
    FROM roster_entries r
    JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
    JOIN workers w ON w.id = r.worker_id
  ),
  counted AS (
    SELECT c.worker_id, c.outcome_id, date_trunc('month', c.onset_date)::date AS month
    FROM case_events c
    WHERE c.superseded_by IS NULL AND c.status = ANY($1::text[])
  ),
  first_case AS (
    SELECT worker_id, outcome_id, min(month) AS month FROM counted GROUP BY worker_id, outcome_id
  ),
  case_counts AS (
    SELECT k.worker_id, k.outcome_id, k.month, count(*)::int AS n
    FROM counted k JOIN o USING (outcome_id) WHERE NOT o.first_only
    GROUP BY k.worker_id, k.outcome_id, k.month
    UNION ALL
    SELECT f.worker_id, f.outcome_id, f.month, 1
    FROM first_case f JOIN o USING (outcome_id) WHERE o.first_only
  ),
  case_cells AS (
    SELECT cc.outcome_id, cc.month, a.site_id, a.exposure_group_id, a.birth_year, a.sex, cc.n
    FROM case_counts cc
    JOIN o USING (outcome_id)
    CROSS JOIN last_month lm
    JOIN LATERAL (
      SELECT r.site_id, r.exposure_group_id, w.birth_year, w.sex
      FROM roster_entries r
      JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
      JOIN workers w ON w.id = r.worker_id
      WHERE r.worker_id = cc.worker_id AND r.month = (cc.month - make_interval(months => o.lag_months))::date AND r.hours > 0
      ORDER BY r.hours DESC, r.site_id
      LIMIT 1
    ) a ON true
    WHERE cc.month <= lm.month
  ),
  pt AS (
    SELECT o.outcome_id, (cur.month + make_interval(months => o.lag_months))::date AS month,
           cur.site_id, cur.exposure_group_id, cur.birth_year, cur.sex, cur.hours
    FROM cur
    CROSS JOIN o
    CROSS JOIN last_month lm
    LEFT JOIN first_case f ON o.first_only AND f.worker_id = cur.worker_id AND f.outcome_id = o.outcome_id
    WHERE (cur.month + make_interval(months => o.lag_months))::date <= lm.month
      AND (f.month IS NULL OR (cur.month + make_interval(months => o.lag_months))::date <= f.month)
  )`;

export const CELLS_SQL = `
  WITH ${CTES},
  both_sides AS (
    SELECT outcome_id, month, site_id, exposure_group_id, birth_year, sex, hours, 0 AS n FROM pt
    UNION ALL
    SELECT outcome_id, month, site_id, exposure_group_id, birth_year, sex, 0, n FROM case_cells
  )
  SELECT outcome_id, to_char(month, 'YYYY-MM-DD') AS month, site_id, exposure_group_id,
         CASE WHEN birth_year IS NULL THEN NULL
              ELSE (floor((extract(year FROM month) - birth_year) / 10) * 10)::int END AS age_band,
         sex, sum(hours)::text AS hours, sum(n)::int AS cases
  FROM both_sides
  GROUP BY 1, 2, 3, 4, 5, 6`;

/** Counted cases per outcome after the counting rule, and how many found a roster row. */
export const CASE_TOTALS_SQL = `
  WITH ${CTES}
  SELECT o.outcome_id,
         coalesce((SELECT sum(n) FROM case_counts cc WHERE cc.outcome_id = o.outcome_id), 0)::int AS counted,
         coalesce((SELECT sum(n) FROM case_cells ce WHERE ce.outcome_id = o.outcome_id), 0)::int AS attributed
  FROM o`;

export interface Cell {
  outcomeId: number;
  month: string;
  siteId: number;
  groupId: number;
  ageBand: number | null;
  sex: string | null;
  /** Hours in hundredths, an exact integer. */
  cents: number;
  cases: number;
}

interface CellRow {
  outcome_id: number;
  month: string;
  site_id: number;
  exposure_group_id: number;
  age_band: number | null;
  sex: string | null;
  hours: string;
  cases: number;
}

/** Runs the aggregation and returns its cells. */
export async function loadCells(q: QueryRunner, countedStatuses: CaseStatus[]): Promise<Cell[]> {
  const rows: CellRow[] = await q.query(CELLS_SQL, [countedStatuses]);
  return rows.map((r) => ({
    outcomeId: r.outcome_id,
    month: r.month,
    siteId: r.site_id,
    groupId: r.exposure_group_id,
    ageBand: r.age_band,
    sex: r.sex,
    cents: Math.round(Number(r.hours) * 100),
    cases: r.cases,
  }));
}

export async function loadCaseTotals(q: QueryRunner, countedStatuses: CaseStatus[]): Promise<Array<{ outcomeId: number; counted: number; attributed: number }>> {
  const rows: Array<{ outcome_id: number; counted: number; attributed: number }> = await q.query(CASE_TOTALS_SQL, [countedStatuses]);
  return rows.map((r) => ({ outcomeId: r.outcome_id, counted: r.counted, attributed: r.attributed }));
}
