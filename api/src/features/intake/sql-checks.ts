import type { CellBounds } from '@ratewarden/shared/intake-cell';
import { columnPattern, reasons, type ColumnDef, type ColumnRule } from '@ratewarden/shared/intake-columns';

/** A SQL string literal of a value from our own column definitions (never from a file). */
export function lit(s: string): string {
  return `'${s.replace(/'/g, "''")}'`;
}

/** The trimmed text of a staged cell; NULL (no such column in the file) reads as empty. */
export function cell(alias: string, col: string): string {
  return `btrim(coalesce(${alias}.${col}, ''))`;
}

/** The cell as compared: codes upper-cased, choices in the case they are listed in (as normalizeCell does). */
export function normalized(alias: string, def: ColumnDef): string {
  const v = cell(alias, def.name);
  if (def.rule.type === 'code') return `upper(${v})`;
  if (def.rule.type === 'choice') return def.rule.values.every((x) => x === x.toUpperCase()) ? `upper(${v})` : `lower(${v})`;
  return v;
}

/**
 * True for a YYYY-MM-DD text within the rule's range that is a day of the calendar; never raises
 * on other text (the range comes before the cast: PostgreSQL has no year 0000).
 */
export function isCalendarDateSql(v: string, rule: Extract<ColumnRule, { type: 'date' }>): string {
  return `CASE WHEN ${v} ~ ${lit(columnPattern(rule)!)} AND ${v} BETWEEN ${lit(rule.min)} AND ${lit(rule.max)} THEN ${dayFitsSql(v)} ELSE false END`;
}

/** The day of a well-formed, in-range YYYY-MM-DD text against its month's length. */
function dayFitsSql(v: string): string {
  return `substr(${v}, 9, 2)::int <= extract(day FROM (substr(${v}, 1, 7) || '-01')::date + interval '1 month' - interval '1 day')`;
}

/** Known codes of sites, groups or outcomes (upper case), written into the SQL as literals. */
export interface CodeParams {
  site?: string[];
  exposure_group?: string[];
  outcome?: string[];
}

/**
 * The SQL expression that yields the reason a staged cell is wrong, or NULL when it is fine:
 * the same rule, the same order and the same words as `cellSchema` in shared/intake-schemas.ts.
 * CASE evaluates its branches in order, so a cast only runs once the pattern has matched.
 */
export function cellCheckSql(alias: string, def: ColumnDef, codes: CodeParams, bounds: CellBounds): string {
  const v = cell(alias, def.name);
  const nv = normalized(alias, def);
  const rule = def.rule;
  const branches: string[] = [`WHEN ${v} = '' THEN ${def.required ? lit(reasons.empty(def.name)) : 'NULL'}`];
  const pattern = columnPattern(rule);
  if (pattern) branches.push(`WHEN NOT (${v} ~ ${lit(pattern)}) THEN ${lit(reasons.shape(def.name, rule))}`);
  switch (rule.type) {
    case 'decimal':
    case 'integer':
      branches.push(`WHEN replace(${v}, ',', '.')::numeric NOT BETWEEN ${rule.min} AND ${rule.max} THEN ${lit(reasons.range(def.name, rule.min, rule.max))}`);
      break;
    case 'month':
    case 'date':
      // Text order is date order at a fixed width; the range comes before any cast (no year 0000).
      branches.push(`WHEN ${v} NOT BETWEEN ${lit(rule.min)} AND ${lit(rule.max)} THEN ${lit(reasons.range(def.name, rule.min, rule.max))}`);
      // Day of month against the month's length, the same rule as isCalendarDate.
      if (rule.type === 'date') branches.push(`WHEN NOT (${dayFitsSql(v)}) THEN ${lit(reasons.noSuchDay(def.name))}`);
      if (bounds.latestMonth !== null)
        branches.push(`WHEN substr(${v}, 1, 7) > ${lit(bounds.latestMonth)} THEN ${lit(reasons.future(def.name, bounds.latestMonth))}`);
      break;
    case 'choice':
      branches.push(`WHEN ${nv} NOT IN (${rule.values.map(lit).join(', ')}) THEN ${lit(reasons.shape(def.name, rule))}`);
      break;
    case 'key':
    case 'text':
      branches.push(`WHEN length(${v}) > ${rule.maxLength} THEN ${lit(reasons.shape(def.name, rule))}`);
      break;
    case 'code': {
      const list = codes[rule.ref];
      if (!list) throw new Error(`no code list for ${rule.ref}`);
      // Codes come from the database, whose CHECK allows only letters, digits, _ and -.
      const known = list.length ? `${nv} IN (${list.map(lit).join(', ')})` : 'false';
      branches.push(`WHEN NOT (${known}) THEN ${lit(reasons.unknownCode(def.name, rule.ref))}`);
      break;
    }
  }
  return `CASE ${branches.join(' ')} ELSE NULL END`;
}

/**
 * Inserts one problem per wrong cell into the transaction's `intake_problems` table. A roster
 * repeats few values per column (60 months, a handful of codes, some thousand hour figures), so
 * each column's rule runs on its DISTINCT values only; rows are looked up again only for the
 * values that fail, which for a clean file is none (the hash join then skips its scan).
 */
export function cellChecksInsertSql(table: string, defs: readonly ColumnDef[], codes: CodeParams, bounds: CellBounds): string[] {
  return defs.map(
    (d) => `
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT s.line_no + 1, ${lit(d.name)}, left(s.${d.name}, 200), b.reason
    FROM (SELECT v, reason FROM (SELECT d.${d.name} AS v, ${cellCheckSql('d', d, codes, bounds)} AS reason FROM (SELECT DISTINCT ${d.name} FROM ${table}) d) x
          WHERE reason IS NOT NULL) b
    JOIN ${table} s ON coalesce(s.${d.name}, '') = coalesce(b.v, '')`,
  );
}
