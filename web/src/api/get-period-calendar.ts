import { periodCalendarSchema, type PeriodCalendar } from '@ratewarden/shared/period-calendar';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../lib/api-client';
import { periodKeys } from './period-keys';

/** `from` and `to` as YYYY-MM; without them the latest 18 months received. */
export function getPeriodCalendar(q: { from?: string; to?: string }, signal?: AbortSignal): Promise<PeriodCalendar> {
  const params = new URLSearchParams();
  if (q.from) params.set('from', q.from);
  if (q.to) params.set('to', q.to);
  return api.get(`/api/periods?${params}`, periodCalendarSchema, signal);
}

export const periodCalendarQueryOptions = (q: { from?: string; to?: string } = {}) =>
  queryOptions({ queryKey: periodKeys.calendar(q), queryFn: ({ signal }) => getPeriodCalendar(q, signal) });

/** The calendar of the reader's sites × months; keeps the shown months on screen while others load. */
export function usePeriodCalendar(q: { from?: string; to?: string } = {}, enabled = true) {
  return useQuery({ ...periodCalendarQueryOptions(q), enabled, placeholderData: keepPreviousData });
}
