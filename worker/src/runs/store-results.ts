import type { EntityManager } from 'typeorm';
import { toJsonValue } from '@ratewarden/shared/stats';
import type { ResultRow, TrendRow } from './compute-results';

const dbl = 'double precision';
/** Columns of run_results written from a ResultRow, with their SQL types. */
const RESULT_COLUMNS: Array<[keyof ResultRow, string]> = [
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

const CHUNK = 2_000;

/**
 * Writes a run's results with one INSERT … SELECT FROM jsonb_to_recordset per chunk: one
 * round trip per 2,000 rows instead of one per row. Infinite values travel as the JSON strings
 * "Infinity", which PostgreSQL reads back as double precision infinity.
 */
export async function storeResults(em: EntityManager, runId: string, results: ResultRow[], trends: TrendRow[]): Promise<void> {
  const names = RESULT_COLUMNS.map(([c]) => c).join(', ');
  const defs = RESULT_COLUMNS.map(([c, t]) => `${c} ${t}`).join(', ');
  for (let i = 0; i < results.length; i += CHUNK) {
    const chunk = results.slice(i, i + CHUNK).map((r) => {
      const { periodIndex: _unused, ...row } = r;
      return row;
    });
    await em.query(
      `INSERT INTO run_results (run_id, ${names}) SELECT $1, ${names} FROM jsonb_to_recordset($2::jsonb) AS x(${defs})`,
      [runId, JSON.stringify(toJsonValue(chunk))],
    );
  }
  for (let i = 0; i < trends.length; i += CHUNK) {
    await em.query(
      `INSERT INTO run_trends (run_id, site_id, outcome_id, window_kind, period, chi2, p, u, levels)
       SELECT $1, site_id, outcome_id, window_kind, period, chi2, p, u, levels
       FROM jsonb_to_recordset($2::jsonb) AS x(site_id integer, outcome_id integer, window_kind text, period date, chi2 double precision, p double precision, u double precision, levels jsonb)`,
      [runId, JSON.stringify(toJsonValue(trends.slice(i, i + CHUNK)))],
    );
  }
}
