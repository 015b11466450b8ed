import { columnPattern, normalizeCell, reasons, type ColumnDef } from './intake-columns';

/** Days in a month of the Gregorian calendar; the same rule the SQL check uses. */
export function isCalendarDate(iso: string): boolean {
  const [y, m, d] = iso.split('-').map(Number) as [number, number, number];
  return d <= new Date(Date.UTC(y, m, 0)).getUTCDate();
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
 */
export function cellJudge(col: ColumnDef): (raw: string) => CellVerdict {
  const rule = col.rule;
  const source = columnPattern(rule);
  const pattern = source ? new RegExp(source) : null;
  const empty: CellVerdict = { value: null, text: null, reason: col.required ? reasons.empty(col.name) : null };
  const shape = reasons.shape(col.name, rule);
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
      case 'date':
        return { value: v, text: v, reason: isCalendarDate(v) ? null : reasons.noSuchDay(col.name) };
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
