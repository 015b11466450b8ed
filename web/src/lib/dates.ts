/** Dates and durations as people read them (en-GB, the app's one locale). */
export function formatWhen(iso: string | null | undefined): string {
  return iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—';
}

/** "2024-03-01" → "Mar 2024"; read as a calendar month, never shifted by the time zone. */
export function formatMonth(isoDate: string): string {
  const [y, m] = isoDate.split('-').map(Number);
  return new Date(Date.UTC(y!, (m ?? 1) - 1, 1)).toLocaleString('en-GB', { month: 'short', year: 'numeric', timeZone: 'UTC' });
}

/** Seconds between two instants as "12.3 s" or "4 min 05 s"; null while still running. */
export function formatDuration(startIso: string, endIso: string | null): string {
  if (!endIso) return 'still running';
  const s = (new Date(endIso).getTime() - new Date(startIso).getTime()) / 1000;
  if (s < 60) return `${s.toFixed(1)} s`;
  const m = Math.floor(s / 60);
  return `${m} min ${String(Math.round(s - m * 60)).padStart(2, '0')} s`;
}
