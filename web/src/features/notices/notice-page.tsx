import { Link } from 'react-router';
import { QueryState } from '../../components/feedback/query-state';
import { paths } from '../../config/paths';
import { formatWhen } from '../../lib/dates';
import { useMarkUnread, useOpenNotice } from './api/open-notice';
import { noticeKindLabels, periodWords } from './notice-labels';

/** One notice as its recipient reads it; opening it marks it read. */
export function NoticePage({ id }: { id: string }) {
  const notice = useOpenNotice(id);
  const unread = useMarkUnread(id);
  return (
    <section>
      <p className="text-sm">
        <Link to={paths.notices} className="text-accent underline">
          ← Notices
        </Link>
      </p>
      <QueryState query={notice} label="notice">
        {(n) => (
          <>
            <h1 className="mt-2 text-2xl font-bold tracking-tight">{n.subject}</h1>
            <dl className="mt-4 grid max-w-3xl grid-cols-[auto_1fr] gap-x-6 gap-y-1">
              <dt className="font-medium">Kind</dt>
              <dd>{n.kind ? noticeKindLabels[n.kind] : '—'}</dd>
              <dt className="font-medium">Period</dt>
              <dd>{periodWords(n.period, n.completeness)}</dd>
              <dt className="font-medium">Received</dt>
              <dd>{formatWhen(n.createdAt)}</dd>
            </dl>
            <pre className="mt-4 max-w-3xl whitespace-pre-wrap card p-4 font-sans">{n.text}</pre>
            <div className="no-print mt-4 flex flex-wrap gap-3">
              <Link to={paths.flag(n.flagId)} className="btn btn-primary px-4 py-2">
                Open the flag
              </Link>
              <button type="button" className="btn btn-quiet px-4 py-2" disabled={unread.isPending || unread.isSuccess} onClick={() => unread.mutate()}>
                {unread.isSuccess ? 'Marked as new' : 'Mark as new'}
              </button>
            </div>
          </>
        )}
      </QueryState>
    </section>
  );
}
