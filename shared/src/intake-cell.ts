import { columnPattern, normalizeCell, reasons, type ColumnDef } from './intake-columns';

/** Days in a month of the Gregorian calendar; the same rule the SQL check uses. */
export function isCalendarDate(iso: string): boolean {
  const [y, m, d] = iso.split('-').map(Number) as [number, number, number];
  return d <= new Date(Date.UTC(y, m, 0)).getUTCDate();
}

/**
 * What a cell rule needs from outside the file: the latest month a month or date may fall in (the
 * current month, by the server's clock), or null when months still to come are allowed.
 */
export interface CellBounds {
  latestMonth: string | null;
}

/** No bound beyond the columns' own ranges (previews and schemas that do not know the clock). */
export const NO_BOUNDS: CellBounds = { latestMonth: null };

/** `YYYY-MM` of `now` in UTC. */
export function monthOf(now: Date): string {
  return now.toISOString().slice(0, 7);
}

/**
 * The verdict on one cell: its typed value, the tidied text a database column would take (decimal
 * comma turned into a point, codes upper-cased) and the reason it is wrong, or null when fine.
 */
export interface CellVerdict {
  value: string | number | null;
  text: string | null;
  reason: string | null;
}

/**
 * A judge for the cells of one column, derived from the column's rule (intake-columns.ts): the
 * same order of checks and the same words as the SQL check in the API (sql-checks.ts). The zod
 * row schemas and the streaming roster check both use it, so they cannot say different things.
 * The pattern is compiled once per column, because the roster check calls this per cell.
 * Months and dates are compared as text: the pattern fixes their width, so text order is date order.
 */
export function cellJudge(col: ColumnDef, bounds: CellBounds = NO_BOUNDS): (raw: string) => CellVerdict {
  const rule = col.rule;
  const source = columnPattern(rule);
  const pattern = source ? new RegExp(source) : null;
  const empty: CellVerdict = { value: null, text: null, reason: col.required ? reasons.empty(col.name) : null };
  const shape = reasons.shape(col.name, rule);
  const latest = bounds.latestMonth;
  return (raw) => {
    const v = normalizeCell(rule, raw);
    if (v === '') return empty;
    if (pattern && !pattern.test(v)) return { value: null, text: null, reason: shape };
    switch (rule.type) {
      case 'decimal':
      case 'integer': {
        const text = v.replace(',', '.');
        const n = Number(text);
        const reason = n < rule.min || n > rule.max ? reasons.range(col.name, rule.min, rule.max) : null;
        return { value: n, text: rule.type === 'integer' ? String(n) : text, reason };
      }
      case 'month':
      case 'date': {
        let reason: string | null = null;
        if (v < rule.min || v > rule.max) reason = reasons.range(col.name, rule.min, rule.max);
        else if (rule.type === 'date' && !isCalendarDate(v)) reason = reasons.noSuchDay(col.name);
        else if (latest !== null && v.slice(0, 7) > latest) reason = reasons.future(col.name, latest);
        return { value: v, text: v, reason };
      }
      case 'choice':
        return { value: v, text: v, reason: rule.values.includes(v) ? null : shape };
      case 'key':
      case 'text':
        return { value: v, text: v, reason: v.length > rule.maxLength ? shape : null };
      default:
        return { value: v, text: v, reason: null };
    }
  };
}
