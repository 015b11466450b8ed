import { noticeDetailSchema, noticeSummarySchema, type NoticeDetail } from '@ratewarden/shared/notices';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { api } from '../../../lib/api-client';
import { noticeKeys } from './notice-keys';

/** Opens one of the reader's notices; the server marks it read the first time. */
export function openNotice(id: string): Promise<NoticeDetail> {
  return api.post(`/api/notices/${encodeURIComponent(id)}/open`, noticeDetailSchema);
}

/** The notice, opened once per visit; the inbox lists refetch so it shows as read. */
export function useOpenNotice(id: string) {
  const qc = useQueryClient();
  const query = useQuery({ queryKey: noticeKeys.detail(id), queryFn: () => openNotice(id), staleTime: Infinity, retry: false });
  const fetchedAt = query.dataUpdatedAt;
  useEffect(() => {
    if (fetchedAt) void qc.invalidateQueries({ queryKey: noticeKeys.lists() });
  }, [fetchedAt, qc]);
  return query;
}

export function useMarkUnread(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post(`/api/notices/${encodeURIComponent(id)}/unread`, noticeSummarySchema),
    onSuccess: () => qc.invalidateQueries({ queryKey: noticeKeys.all }),
  });
}
