import type { WindowKind } from '@ratewarden/shared/windows';

/** The measures stored with their confidence limits: `<m>`, `<m>_lower` and `<m>_upper`. */
export type ResultInterval = 'rate' | 'irr' | 'ird' | `mh_${ResultAdjustment}_irr` | `mh_${ResultAdjustment}_ird`;

/** The Mantel–Haenszel adjustments stored beside the crude comparison. */
export type ResultAdjustment = 'age' | 'site' | 'sex';

/**
 * One stored result of a run: a row of `run_results` (migrations Runs, RunScopes, AnalysisWindows),
 * keyed by its column names. The one row type of the table: the worker writes it with COPY
 * (worker/src/runs/copy-lines.ts, RESULT_COLUMNS) and the api reads it with SQL
 * (api/src/features/runs/run-results.ts, run-diff.ts, run-period-index.ts, run-strata.ts), each
 * reader as this row or a `Pick<>` of it. No entity: the table is written and read set-wise only.
 *
 * As node-postgres reads the columns: a double as a number (±Infinity included; NaN is stored as
 * null), the numeric `hours` as text, the jsonb `detail` parsed. `period` is the period's last
 * month as YYYY-MM-DD: a reader selects it with to_char (node-postgres would give a date a Date).
 */
export interface StoredResult {
  run_id: string;
  /** null: the whole company (every site); a site id: that site's cells alone. */
  site_id: number | null;
  outcome_id: number;
  exposure_group_id: number;
  window_kind: WindowKind;
  period: string;
  months_covered: number;
  is_reference: boolean;
  reference_group_id: number | null;
  cases: number;
  /** numeric(16, 2), as text to keep it exact. */
  hours: string;
  person_time: number;
  rate: number | null;
  rate_lower: number | null;
  rate_upper: number | null;
  expected: number | null;
  irr: number | null;
  irr_lower: number | null;
  irr_upper: number | null;
  irr_p: number | null;
  irr_wald_lower: number | null;
  irr_wald_upper: number | null;
  ird: number | null;
  ird_lower: number | null;
  ird_upper: number | null;
  ird_p: number | null;
  mh_age_irr: number | null;
  mh_age_irr_lower: number | null;
  mh_age_irr_upper: number | null;
  mh_age_irr_p: number | null;
  mh_age_ird: number | null;
  mh_age_ird_lower: number | null;
  mh_age_ird_upper: number | null;
  mh_site_irr: number | null;
  mh_site_irr_lower: number | null;
  mh_site_irr_upper: number | null;
  mh_site_irr_p: number | null;
  mh_site_ird: number | null;
  mh_site_ird_lower: number | null;
  mh_site_ird_upper: number | null;
  mh_sex_irr: number | null;
  mh_sex_irr_lower: number | null;
  mh_sex_irr_upper: number | null;
  mh_sex_irr_p: number | null;
  mh_sex_ird: number | null;
  mh_sex_ird_lower: number | null;
  mh_sex_ird_upper: number | null;
  u_centre: number | null;
  u_lcl: number | null;
  u_ucl: number | null;
  u_signal: 'above' | 'below' | 'within' | null;
  detail: Record<string, unknown>;
}

/** The columns of a result the worker writes after the run id (COPY's column list, in order). */
export type ResultColumn = Exclude<keyof StoredResult, 'run_id'>;
