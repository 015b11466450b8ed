import { fieldWords } from '@ratewarden/shared/audit-actions';
import { formatFigure } from '@ratewarden/shared/number-format';

/**
 * An audit entry's detail as fields: each key in words beside its value, nested values (a change's
 * before and after) as their own small lists. The API has already taken out every count and
 * measure value (the administrator may not read aggregates).
 */
function valueWords(v: unknown): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v === 'number') return formatFigure(v);
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (Array.isArray(v)) return v.length === 0 ? 'none' : v.map(valueWords).join(', ');
  return String(v);
}

export function AuditDetail({ detail }: { detail: Record<string, unknown> }) {
  const entries = Object.entries(detail);
  if (entries.length === 0) return <span className="text-ink-soft">—</span>;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-xs">
      {entries.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-soft">{fieldWords(k)}</dt>
          <dd>{v !== null && typeof v === 'object' && !Array.isArray(v) ? <AuditDetail detail={v as Record<string, unknown>} /> : valueWords(v)}</dd>
        </div>
      ))}
    </dl>
  );
}
