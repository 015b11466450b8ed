import type { NoticeKind } from '@ratewarden/shared/notices';
import { formatMonth } from '../../lib/dates';

export const noticeKindLabels: Record<NoticeKind, string> = {
  raised: 'Flag raised',
  escalated: 'Flag worsened',
  eased: 'Follow-up: worsening withdrawn',
  cleared: 'Follow-up: no longer past the rule',
  crossed_again: 'Past the rule again',
};

export function periodWords(period: string | null, completeness: string | null): string {
  if (!period) return '—';
  return `${formatMonth(period)}${completeness === 'partial' ? ', partial' : completeness === 'complete' ? ', complete' : ''}`;
}
