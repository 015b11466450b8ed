/**
 * Case attribution: the one statement of which roster row a case is counted in, and which cases a
 * first-event outcome counts. Every process builds its SQL from these fragments: the run's
 * aggregation and its unattributed cases (worker/src/runs/cells-query.ts), the cases behind a flag
 * (api/src/features/flags/flags-service.ts), the case register (api/src/features/cases/case-queries.ts),
 * the case list's diff (api/src/features/intake/case-intake.ts) and the roster check's orphaned cases
 * (api/src/features/intake/roster-orphans.ts).
 *
 * The rule:
 * - Lag. A case with onset in month c, of an outcome with exposure lag L months, is attributed to the
 *   worker's roster of month c − L (the exposure that month is taken to have caused it).
 * - The row. Of the worker's current roster rows of that month (rows whose intake holds their
 *   site × month in `roster_slices`) with hours > 0, the one with most hours; on equal hours, the
 *   one of the lowest site id (a fixed order, so that every reader picks the same row). A worker
 *   has one row per site and month, so (hours, site) orders them fully. No such row: the case is
 *   counted but unattributed (the run states why: `UNATTRIBUTED_SQL`).
 * - First event. For an outcome counted `first_event`, a worker's counted cases of the outcome
 *   (current versions with a counted status) count only the earliest by onset date; on one day,
 *   the lowest case event id. The run counts the same aggregated: one case in the month of each
 *   worker's earliest counted case (`first_case` in cells-query.ts), and removes their later
 *   person-time.
 *
 * Aliases inside the fragments are `r` (roster_entries), `s` (roster_slices), `w` (workers) and
 * `e` (case_events): a caller passes expressions over its own, other aliases.
 */

/** The roster month a case of onset month `onsetMonth` (a date, first of month) is attributed to, at lag `lagMonths`. */
export const rosterMonthOf = (onsetMonth: string, lagMonths: string): string => `(${onsetMonth} - make_interval(months => ${lagMonths}))::date`;

/** The onset month (first of month, a timestamp) of an onset date. */
export const onsetMonthOf = (onsetDate: string): string => `date_trunc('month', ${onsetDate})`;

export interface AttributingRowOptions {
  /** Columns of `r` (and `w` when `withWorker`) the subquery returns; the site and exposure group by default. */
  columns?: string;
  /** Joins `workers w` on the row's worker (birth year and sex for the run's cells). */
  withWorker?: boolean;
}

/**
 * The subquery returning the one roster row that attributes a case of worker `workerId` in roster
 * month `rosterMonth` (built with rosterMonthOf), or no row. Use it as
 * `JOIN LATERAL (${attributingRow(...)}) a ON true` (LEFT JOIN LATERAL to keep unattributed cases).
 */
export function attributingRow(workerId: string, rosterMonth: string, options: AttributingRowOptions = {}): string {
  const columns = options.columns ?? 'r.site_id, r.exposure_group_id';
  return `SELECT ${columns}
      FROM roster_entries r
      JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month${
        options.withWorker ? '\n      JOIN workers w ON w.id = r.worker_id' : ''
      }
      WHERE r.worker_id = ${workerId} AND r.month = ${rosterMonth} AND r.hours > 0
      ORDER BY r.hours DESC, r.site_id
      LIMIT 1`;
}

/**
 * A condition true when case event `alias` (a case_events row) is counted by its outcome's
 * counting rule among the cases with a status in `statuses` (a text[] expression): always for a
 * recurrent outcome, for a first-event one only when no current counted case of the same worker
 * and outcome is earlier (onset date, then id). `countingRule` is the outcome's counting_rule
 * column. The case itself must have a counted status for the answer to mean "counted".
 */
export function countedByRule(alias: string, countingRule: string, statuses: string): string {
  return `(${countingRule} <> 'first_event' OR NOT EXISTS (
      SELECT 1 FROM case_events e
      WHERE e.superseded_by IS NULL AND e.worker_id = ${alias}.worker_id AND e.outcome_id = ${alias}.outcome_id
        AND e.status = ANY(${statuses}) AND (e.onset_date, e.id) < (${alias}.onset_date, ${alias}.id)))`;
}
