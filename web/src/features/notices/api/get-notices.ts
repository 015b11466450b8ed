import { noticeSummarySchema, type NoticeListQuery, type NoticeSummary } from '@ratewarden/shared/notices';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { noticeKeys } from './notice-keys';

/** The signed-in person's notices, newest first. */
export function getNotices(f: NoticeListQuery, signal?: AbortSignal): Promise<NoticeSummary[]> {
  const q = new URLSearchParams(Object.entries(f).filter(([, v]) => v) as Array<[string, string]>).toString();
  return api.get(`/api/notices${q ? `?${q}` : ''}`, z.array(noticeSummarySchema), signal);
}

export function useNotices(f: NoticeListQuery) {
  return useQuery({ queryKey: noticeKeys.list(f), queryFn: ({ signal }) => getNotices(f, signal), placeholderData: keepPreviousData });
}
