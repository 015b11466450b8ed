import { stringifyJson } from '@ratewarden/shared/stats';
import type { Cell } from './cells-query';
import type { ResultColumn } from '@ratewarden/db/run-results';
import type { ResultRow } from './compute-results';

const dbl = 'double precision';
/** Columns of run_results (db/src/run-results.ts) written from a ResultRow, with their SQL types (the types document the table; COPY takes them from it). */
export const RESULT_COLUMNS = [
  ['site_id', 'integer'],
  ['outcome_id', 'integer'],
  ['exposure_group_id', 'integer'],
  ['window_kind', 'text'],
  ['period', 'date'],
  ['months_covered', 'smallint'],
  ['is_reference', 'boolean'],
  ['reference_group_id', 'integer'],
  ['cases', 'integer'],
  ['hours', 'numeric'],
  ['person_time', dbl],
  ['rate', dbl],
  ['rate_lower', dbl],
  ['rate_upper', dbl],
  ['expected', dbl],
  ['irr', dbl],
  ['irr_lower', dbl],
  ['irr_upper', dbl],
  ['irr_p', dbl],
  ['irr_wald_lower', dbl],
  ['irr_wald_upper', dbl],
  ['ird', dbl],
  ['ird_lower', dbl],
  ['ird_upper', dbl],
  ['ird_p', dbl],
  ['mh_age_irr', dbl],
  ['mh_age_irr_lower', dbl],
  ['mh_age_irr_upper', dbl],
  ['mh_age_irr_p', dbl],
  ['mh_age_ird', dbl],
  ['mh_age_ird_lower', dbl],
  ['mh_age_ird_upper', dbl],
  ['mh_site_irr', dbl],
  ['mh_site_irr_lower', dbl],
  ['mh_site_irr_upper', dbl],
  ['mh_site_irr_p', dbl],
  ['mh_site_ird', dbl],
  ['mh_site_ird_lower', dbl],
  ['mh_site_ird_upper', dbl],
  ['mh_sex_irr', dbl],
  ['mh_sex_irr_lower', dbl],
  ['mh_sex_irr_upper', dbl],
  ['mh_sex_irr_p', dbl],
  ['mh_sex_ird', dbl],
  ['mh_sex_ird_lower', dbl],
  ['mh_sex_ird_upper', dbl],
  ['u_centre', dbl],
  ['u_lcl', dbl],
  ['u_ucl', dbl],
  ['u_signal', 'text'],
  ['detail', 'jsonb'],
] as const satisfies ReadonlyArray<readonly [ResultColumn, string]>;

/** Every stored column is written: a column of StoredResult missing above is named here, and fails to compile. */
const everyColumnWritten: Record<Exclude<ResultColumn, (typeof RESULT_COLUMNS)[number][0]>, never> = {};
void everyColumnWritten;

const NEEDS_ESCAPE = /[\\\t\n\r]/;
const ESCAPED = /[\\\t\n\r]/g;

/** One value in COPY's text format: \N for null, ±∞ spelled as PostgreSQL reads them, text escaped. */
export function copyValue(v: unknown): string {
  if (v === null || v === undefined) return '\\N';
  if (typeof v === 'number') {
    if (Number.isNaN(v)) return '\\N';
    return v === Infinity ? 'Infinity' : v === -Infinity ? '-Infinity' : String(v);
  }
  if (typeof v === 'boolean') return v ? 't' : 'f';
  const text = typeof v === 'string' ? v : stringifyJson(v);
  return NEEDS_ESCAPE.test(text) ? text.replace(ESCAPED, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r')) : text;
}

/** One run_results row as a line of COPY text, run id first (the column order of RESULT_COLUMNS). */
export function resultLine(runId: string, r: ResultRow): string {
  let out = copyValue(runId);
  for (const [c] of RESULT_COLUMNS) out += `\t${copyValue(r[c])}`;
  return `${out}\n`;
}

export const CELLS_COLUMNS = ['outcome_id', 'exposure_group_id', 'months', 'site_ids', 'age_bands', 'sexes', 'hours', 'cases'];

/** An array literal of PostgreSQL ({a,b,NULL}); text elements double-quoted with " and \ escaped. */
function arrayLiteral(values: Array<string | number | null>, quote = false): string {
  return `{${values.map((v) => (v === null ? 'NULL' : quote ? `"${String(v).replace(/["\\]/g, (c) => `\\${c}`)}"` : String(v))).join(',')}}`;
}

/**
 * The run_cells rows of a run as COPY text, run id first (CELLS_COLUMNS): one line per outcome ×
 * exposure group, its cells as parallel arrays; hours from exact hundredths.
 */
export function cellsLines(runId: string, cells: Cell[]): string {
  const byKey = new Map<string, Cell[]>();
  for (const c of cells) {
    const key = `${c.outcomeId}\t${c.groupId}`;
    const list = byKey.get(key);
    if (list) list.push(c);
    else byKey.set(key, [c]);
  }
  let out = '';
  for (const [key, list] of byKey) {
    const cols = [
      arrayLiteral(list.map((c) => c.month)),
      arrayLiteral(list.map((c) => c.siteId)),
      arrayLiteral(list.map((c) => c.ageBand)),
      arrayLiteral(
        list.map((c) => c.sex),
        true,
      ),
      arrayLiteral(list.map((c) => (c.cents / 100).toFixed(2))),
      arrayLiteral(list.map((c) => c.cases)),
    ];
    out += `${runId}\t${key}\t${cols.map((v) => copyValue(v)).join('\t')}\n`;
  }
  return out;
}
