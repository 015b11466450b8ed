import { toJsonValue } from '@ratewarden/shared/stats';
import type { Cell } from './cells-query';
import type { ResultRow, TrendRow } from './compute-results';

const dbl = 'double precision';
/** Columns of run_results written from a ResultRow, with their SQL types (the types document the table; COPY takes them from it). */
export const RESULT_COLUMNS: Array<[keyof ResultRow, string]> = [
  ['site_id', 'integer'], ['outcome_id', 'integer'], ['exposure_group_id', 'integer'], ['window_kind', 'text'], ['period', 'date'],
  ['months_covered', 'smallint'], ['is_reference', 'boolean'], ['reference_group_id', 'integer'],
  ['cases', 'integer'], ['hours', 'numeric'], ['person_time', dbl],
  ['rate', dbl], ['rate_lower', dbl], ['rate_upper', dbl], ['expected', dbl],
  ['irr', dbl], ['irr_lower', dbl], ['irr_upper', dbl], ['irr_p', dbl], ['irr_wald_lower', dbl], ['irr_wald_upper', dbl],
  ['ird', dbl], ['ird_lower', dbl], ['ird_upper', dbl], ['ird_p', dbl],
  ['mh_age_irr', dbl], ['mh_age_irr_lower', dbl], ['mh_age_irr_upper', dbl], ['mh_age_irr_p', dbl],
  ['mh_age_ird', dbl], ['mh_age_ird_lower', dbl], ['mh_age_ird_upper', dbl],
  ['mh_site_irr', dbl], ['mh_site_irr_lower', dbl], ['mh_site_irr_upper', dbl], ['mh_site_irr_p', dbl],
  ['mh_site_ird', dbl], ['mh_site_ird_lower', dbl], ['mh_site_ird_upper', dbl],
  ['mh_sex_irr', dbl], ['mh_sex_irr_lower', dbl], ['mh_sex_irr_upper', dbl], ['mh_sex_irr_p', dbl],
  ['mh_sex_ird', dbl], ['mh_sex_ird_lower', dbl], ['mh_sex_ird_upper', dbl],
  ['u_centre', dbl], ['u_lcl', dbl], ['u_ucl', dbl], ['u_signal', 'text'], ['detail', 'jsonb'],
];

/** One value in COPY's text format: \N for null, ±∞ spelled as PostgreSQL reads them, text escaped. */
export function copyValue(v: unknown): string {
  if (v === null || v === undefined) return '\\N';
  if (typeof v === 'number') {
    if (Number.isNaN(v)) return '\\N';
    return v === Infinity ? 'Infinity' : v === -Infinity ? '-Infinity' : String(v);
  }
  if (typeof v === 'boolean') return v ? 't' : 'f';
  const text = typeof v === 'string' ? v : JSON.stringify(toJsonValue(v));
  return text.replace(/[\\\t\n\r]/g, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r'));
}

export const TREND_COLUMNS: Array<keyof TrendRow> = ['site_id', 'outcome_id', 'window_kind', 'period', 'chi2', 'p', 'u', 'levels'];

/** One run_results row as a line of COPY text, run id first (the column order of RESULT_COLUMNS). */
export function resultLine(runId: string, r: ResultRow): string {
  let out = copyValue(runId);
  for (const [c] of RESULT_COLUMNS) out += `\t${copyValue(r[c])}`;
  return `${out}\n`;
}

export const CELL_COLUMNS = ['outcome_id', 'month', 'site_id', 'exposure_group_id', 'age_band', 'sex', 'hours', 'cases'];

/** One run_cells row as a line of COPY text, run id first (CELL_COLUMNS); hours from exact hundredths. */
export function cellLine(runId: string, c: Cell): string {
  return `${runId}\t${c.outcomeId}\t${c.month}\t${c.siteId}\t${c.groupId}\t${copyValue(c.ageBand)}\t${copyValue(c.sex)}\t${(c.cents / 100).toFixed(2)}\t${c.cases}\n`;
}

/** One run_trends row as a line of COPY text (TREND_COLUMNS). */
export function trendLine(runId: string, t: TrendRow): string {
  let out = copyValue(runId);
  for (const c of TREND_COLUMNS) out += `\t${copyValue(t[c])}`;
  return `${out}\n`;
}
