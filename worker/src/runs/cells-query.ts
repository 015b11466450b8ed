import type { QueryRunner } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';
import type { UnattributedReason } from '@ratewarden/shared/unattributed';
import { attributingRow, rosterMonthOf } from '@ratewarden/db/case-attribution';

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
 * - A case is attributed to one roster row with hours, by the rule of db/src/case-attribution.ts
 *   (attributingRow); a case with no such row matches no cell and is counted apart as
 *   unattributed, with its reason (UNATTRIBUTED_SQL).
 * - Age band of (calendar year of the month − birth year), by the run's age band edges ($2, an
 *   increasing list): stored by its lower bound, 0 under the first edge (shared/src/age-bands.ts);
 *   null when the birth year is unknown.
 */
const SHIFT = (col: string) => `(${col} + make_interval(months => o.lag_months))::date`;

/**
 * Person-time at its finest grain, month × site × group × birth year × sex, over the current
 * slices: from each intake's stored sums (`roster_sums`, kept by triggers; see its migration),
 * or summed from the roster entries themselves (the benchmark's bare GROUP BY, and the tests'
 * check that the sums agree with the entries).
 */
const BASE_FROM = {
  // A slice names one intake, whose sums hold one row per group × birth year × sex: no GROUP BY.
  sums: `base AS (
    SELECT r.month, r.site_id, r.exposure_group_id, r.birth_year, r.sex, r.hours
    FROM roster_sums r
    JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
  )`,
  entries: `base AS (
    SELECT r.month, r.site_id, r.exposure_group_id, w.birth_year, w.sex, sum(r.hours) AS hours
    FROM roster_entries r
    JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
    JOIN workers w ON w.id = r.worker_id
    GROUP BY r.month, r.site_id, r.exposure_group_id, w.birth_year, w.sex
  )`,
} as const;

const ctes = (base: string) => `
  o AS (
    SELECT id AS outcome_id, lag_months, counting_rule = 'first_event' AS first_only FROM outcomes
  ),
  last_month AS (SELECT max(month) AS month FROM roster_slices),
  counted AS (
    SELECT c.id, c.worker_id, c.outcome_id, c.onset_date, date_trunc('month', c.onset_date)::date AS month
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
      ${attributingRow('cc.worker_id', rosterMonthOf('cc.month', 'o.lag_months'), { columns: 'r.site_id, r.exposure_group_id, w.birth_year, w.sex', withWorker: true })}
    ) a ON true
    WHERE cc.month <= lm.month
  ),
  ${base},
  removed AS (
    SELECT f.outcome_id, r.month, r.site_id, r.exposure_group_id, w.birth_year, w.sex, sum(r.hours) AS hours
    FROM first_case f
    JOIN o ON o.outcome_id = f.outcome_id AND o.first_only
    JOIN roster_entries r ON r.worker_id = f.worker_id AND ${SHIFT('r.month')} > f.month
    JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
    JOIN workers w ON w.id = r.worker_id
    GROUP BY f.outcome_id, r.month, r.site_id, r.exposure_group_id, w.birth_year, w.sex
  ),
  pt AS (
    SELECT o.outcome_id, ${SHIFT('b.month')} AS month, b.site_id, b.exposure_group_id, b.birth_year, b.sex, b.hours
    FROM base b CROSS JOIN o CROSS JOIN last_month lm
    WHERE ${SHIFT('b.month')} <= lm.month
    UNION ALL
    SELECT x.outcome_id, ${SHIFT('x.month')}, x.site_id, x.exposure_group_id, x.birth_year, x.sex, -x.hours
    FROM removed x JOIN o USING (outcome_id) CROSS JOIN last_month lm
    WHERE ${SHIFT('x.month')} <= lm.month
  )`;
const CTES = ctes(BASE_FROM.sums);

/**
 * The roster's hours per month × site × group × birth year × sex (`base`) are credited to every
 * outcome at the outcome's lag, and for first-event outcomes the hours after each worker's first
 * case (`removed`, read through the worker index) are subtracted; `both_sides` lists those hours
 * beside the attributed cases at the birth-year grain, and each reader aggregates it once: the
 * cells by the analysis age bands (below), the SIR by the reference table's own bands (sir-query.ts).
 */
const sidesCtes = (base: string) => `${ctes(base)},
  both_sides AS (
    SELECT outcome_id, month, site_id, exposure_group_id, birth_year, sex, hours, 0 AS n FROM pt
    UNION ALL
    SELECT outcome_id, month, site_id, exposure_group_id, birth_year, sex, 0, n FROM case_cells
  )`;
export const SIDES_CTES = sidesCtes(BASE_FROM.sums);

/** The cells from `both_sides` by the analysis age bands ($2, an increasing list of edges). */
export const CELL_ROWS = `
  SELECT outcome_id, to_char(month, 'YYYY-MM-DD') AS month, site_id, exposure_group_id, age_band, sex, hours::text, cases::int
  FROM (
    SELECT outcome_id, month, site_id, exposure_group_id,
           CASE WHEN birth_year IS NULL THEN NULL
                ELSE coalesce(($2::int[])[nullif(width_bucket((extract(year FROM month) - birth_year)::int, $2::int[]), 0)], 0) END AS age_band,
           sex, sum(hours) AS hours, sum(n) AS cases
    FROM both_sides
    GROUP BY 1, 2, 3, 4, 5, 6
    HAVING sum(hours) > 0 OR sum(n) > 0
  ) c`;

const cellsSql = (base: string) => `WITH ${sidesCtes(base)} ${CELL_ROWS}`;

/** The run's cells ($1 counted statuses, $2 age band edges), person-time from the stored sums. */
export const CELLS_SQL = cellsSql(BASE_FROM.sums);

/**
 * The same cells with the roster's 1.2 M entries (on the benchmark) summed anew: what the run
 * would cost without `roster_sums`, the run benchmark's bare GROUP BY, and the tests' check
 * that the sums the triggers keep give the cells the entries give.
 */
export const CELLS_FROM_ENTRIES_SQL = cellsSql(BASE_FROM.entries);

/** Counted cases per outcome after the counting rule (those matching a roster row are in the cells). */
export const COUNTED_CASES_SQL = `
  WITH ${CTES}
  SELECT outcome_id, sum(n)::int AS counted FROM case_counts GROUP BY outcome_id`;

/**
 * Every counted case event that matches no cell, with its reason, in Ratewarden's words:
 * - `lag_outside_data`: the onset month is after the last rostered month (the cells cut it), or
 *   the onset month minus the lag is before the first rostered month: the data cannot say;
 * - `removed_by_correction`: no current roster row with hours for the worker in that month, but a
 *   superseded version of a site × month slice had one (a roster correction took it away);
 * - `no_roster_month`: no roster row with hours for the worker in that month, in any version.
 * A first-event outcome counts one event per worker (the earliest; on one day, the lowest id), as
 * `case_counts` does, so per outcome these rows and the cells' cases add up to the counted cases.
 */
export const UNATTRIBUTED_SQL = `
  WITH ${CTES},
  first_month AS (SELECT min(month) AS month FROM roster_slices),
  kept AS (
    SELECT k.id, k.worker_id, k.outcome_id, k.month FROM counted k JOIN o USING (outcome_id) WHERE NOT o.first_only
    UNION ALL
    SELECT * FROM (
      SELECT DISTINCT ON (k.worker_id, k.outcome_id) k.id, k.worker_id, k.outcome_id, k.month
      FROM counted k JOIN o USING (outcome_id) WHERE o.first_only
      ORDER BY k.worker_id, k.outcome_id, k.onset_date, k.id
    ) f
  ),
  lagged AS (
    SELECT k.id, k.worker_id, k.outcome_id, k.month, ${rosterMonthOf('k.month', 'o.lag_months')} AS roster_month
    FROM kept k JOIN o USING (outcome_id)
  )
  SELECT x.id::text AS case_event_id, x.outcome_id,
    CASE
      WHEN lm.month IS NULL OR x.month > lm.month OR x.roster_month < fm.month THEN 'lag_outside_data'
      WHEN EXISTS (
        SELECT 1 FROM roster_entries r
        WHERE r.worker_id = x.worker_id AND r.month = x.roster_month AND r.hours > 0
          AND NOT EXISTS (SELECT 1 FROM roster_slices s WHERE s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month)
      ) THEN 'removed_by_correction'
      ELSE 'no_roster_month'
    END AS reason
  FROM lagged x CROSS JOIN last_month lm CROSS JOIN first_month fm
  WHERE lm.month IS NULL OR x.month > lm.month OR NOT EXISTS (
    SELECT 1 FROM roster_entries r
    JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
    WHERE r.worker_id = x.worker_id AND r.month = x.roster_month AND r.hours > 0
  )
  ORDER BY x.outcome_id, x.id`;

/**
 * Session settings for the aggregation, applied with SET LOCAL inside the run's snapshot
 * transaction (and by the benchmark around its bare GROUP BY, so both sides run alike).
 * JIT off: the aggregation is one plan of some 250 expressions, and compiling them took longer
 * (about 20 s measured on the 1.2 M-row benchmark roster) than executing the whole query without
 * JIT (about 5 s); the query is I/O and hashing bound, which JIT does not speed up.
 * work_mem stays at the server's setting: at 64 MB the planner hashed the whole roster for the
 * unattributed cases' look-ups (0.2 s became 4 to 6 s on the benchmark).
 */
export const AGGREGATION_SETTINGS: ReadonlyArray<[string, string]> = [['jit', 'off']];

/** Applies AGGREGATION_SETTINGS to the current transaction (SET LOCAL: gone at commit). */
export async function applyAggregationSettings(q: { query(sql: string, params?: unknown[]): Promise<unknown> }): Promise<void> {
  for (const [name, value] of AGGREGATION_SETTINGS) await q.query(`SELECT set_config($1, $2, true)`, [name, value]);
}

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

export interface CellRow {
  outcome_id: number;
  month: string;
  site_id: number;
  exposure_group_id: number;
  age_band: number | null;
  sex: string | null;
  hours: string;
  cases: number;
}

/** A cell from its row (hours as exact hundredths). */
export function cellOf(r: CellRow): Cell {
  return {
    outcomeId: r.outcome_id,
    month: r.month,
    siteId: r.site_id,
    groupId: r.exposure_group_id,
    ageBand: r.age_band,
    sex: r.sex,
    cents: Math.round(Number(r.hours) * 100),
    cases: r.cases,
  };
}

/** Runs the aggregation and returns its cells (CELLS_SQL; with reference rates, sir-query.ts loadCellsAndSir reads both at once). */
export async function loadCells(q: QueryRunner, countedStatuses: CaseStatus[], ageBandEdges: readonly number[]): Promise<Cell[]> {
  const rows: CellRow[] = await q.query(CELLS_SQL, [countedStatuses, ageBandEdges]);
  return rows.map(cellOf);
}

/** Cases counted per outcome, and how many of them the cells hold (the rest matched no roster row). */
export async function loadCaseTotals(
  q: QueryRunner,
  countedStatuses: CaseStatus[],
  cells: Cell[],
): Promise<Array<{ outcomeId: number; counted: number; attributed: number }>> {
  const rows: Array<{ outcome_id: number; counted: number }> = await q.query(COUNTED_CASES_SQL, [countedStatuses]);
  const attributed = new Map<number, number>();
  for (const c of cells) attributed.set(c.outcomeId, (attributed.get(c.outcomeId) ?? 0) + c.cases);
  return rows.map((r) => ({ outcomeId: r.outcome_id, counted: r.counted, attributed: attributed.get(r.outcome_id) ?? 0 }));
}

export interface UnattributedCase {
  caseEventId: string;
  outcomeId: number;
  reason: UnattributedReason;
}

/** The counted cases no roster row attributes, with their reasons (UNATTRIBUTED_SQL). */
export async function loadUnattributed(q: QueryRunner, countedStatuses: CaseStatus[]): Promise<UnattributedCase[]> {
  const rows: Array<{ case_event_id: string; outcome_id: number; reason: UnattributedReason }> = await q.query(UNATTRIBUTED_SQL, [countedStatuses]);
  return rows.map((r) => ({ caseEventId: r.case_event_id, outcomeId: r.outcome_id, reason: r.reason }));
}
