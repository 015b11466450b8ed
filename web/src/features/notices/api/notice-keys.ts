import type { NoticeListQuery } from '@ratewarden/shared/notices';

/** Query keys of the inbox; opening a notice or marking it new invalidates them all. */
export const noticeKeys = {
  all: ['notices'] as const,
  lists: () => [...noticeKeys.all, 'list'] as const,
  list: (f: NoticeListQuery) => [...noticeKeys.lists(), f] as const,
  detail: (id: string) => [...noticeKeys.all, 'detail', id] as const,
};
