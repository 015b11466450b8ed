/**
 * The audit log's "When" filter in words, turned into the API's range (`from` inclusive, `to`
 * exclusive, both as dates): today, the last 7 or 30 days counting today, or chosen days with
 * both ends included.
 */
export type AuditWhen = 'any' | 'today' | 'week' | 'month' | 'chosen';

export const auditWhenOptions: { value: AuditWhen; label: string }[] = [
  { value: 'any', label: 'Any time' },
  { value: 'today', label: 'Today' },
  { value: 'week', label: 'The last 7 days' },
  { value: 'month', label: 'The last 30 days' },
  { value: 'chosen', label: 'Between chosen days' },
];

const day = (d: Date) => d.toISOString().slice(0, 10);
const plusDays = (iso: string, n: number) => {
  const d = new Date(`${iso}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return day(d);
};

export function auditRange(when: AuditWhen, today: string, chosen: { from?: string; to?: string } = {}): { from?: string; to?: string } {
  switch (when) {
    case 'any':
      return {};
    case 'today':
      return { from: today, to: plusDays(today, 1) };
    case 'week':
      return { from: plusDays(today, -6), to: plusDays(today, 1) };
    case 'month':
      return { from: plusDays(today, -29), to: plusDays(today, 1) };
    case 'chosen':
      return { ...(chosen.from ? { from: chosen.from } : {}), ...(chosen.to ? { to: plusDays(chosen.to, 1) } : {}) };
  }
}

/** "in the last 7 days", "between 3 Mar 2026 and 5 Mar 2026": the range as the page states it. */
export function auditWhenWords(when: AuditWhen, chosen: { from?: string; to?: string } = {}): string {
  const words = (iso: string) => new Date(`${iso}T00:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
  switch (when) {
    case 'any':
      return 'at any time';
    case 'today':
      return 'today';
    case 'week':
      return 'in the last 7 days';
    case 'month':
      return 'in the last 30 days';
    case 'chosen':
      if (chosen.from && chosen.to) return `between ${words(chosen.from)} and ${words(chosen.to)}`;
      if (chosen.from) return `from ${words(chosen.from)}`;
      if (chosen.to) return `up to ${words(chosen.to)}`;
      return 'at any time';
  }
}
