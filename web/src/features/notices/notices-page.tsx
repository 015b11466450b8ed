import { noticeKindSchema, noticeReadStateSchema, type NoticeListQuery } from '@ratewarden/shared/notices';
import { Link, useSearchParams } from 'react-router';
import { QueryState } from '../../components/feedback/query-state';
import { SelectField } from '../../components/form/select-field';
import { ScrollRegion } from '../../components/table/scroll-region';
import { paths } from '../../config/paths';
import { formatWhen } from '../../lib/dates';
import { useNotices } from './api/get-notices';
import { noticeKindLabels, periodWords } from './notice-labels';

/**
 * The signed-in person's threshold notices: what each is about, its flag, period and completeness,
 * and whether it has been read. The e-mail only says there is one; it is read here.
 */
export function NoticesPage() {
  const [params, setParams] = useSearchParams();
  const state = noticeReadStateSchema.safeParse(params.get('state')).data;
  const kind = noticeKindSchema.safeParse(params.get('kind')).data;
  const filters: NoticeListQuery = { ...(state ? { state } : {}), ...(kind ? { kind } : {}) };
  const notices = useNotices(filters);
  const setFilter = (key: string, value: string) =>
    setParams((p) => {
      const next = new URLSearchParams(p);
      if (value) next.set(key, value);
      else next.delete(key);
      return next;
    });
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Notices</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        The threshold notices addressed to you: a watch rule crossed, a flag worsened, and the follow-ups. The e-mail you receive only links here. A flag is a
        prompt for review by qualified people, not a diagnosis or proof of cause.
      </p>
      <div className="no-print mt-4 flex flex-wrap gap-4">
        <SelectField
          label="Show"
          value={state ?? ''}
          onChange={(e) => setFilter('state', e.target.value)}
          options={[
            { value: '', label: 'All notices' },
            { value: 'new', label: 'New only' },
            { value: 'read', label: 'Read only' },
          ]}
        />
        <SelectField
          label="Kind"
          value={kind ?? ''}
          onChange={(e) => setFilter('kind', e.target.value)}
          options={[{ value: '', label: 'Every kind' }, ...noticeKindSchema.options.map((k) => ({ value: k, label: noticeKindLabels[k] }))]}
        />
      </div>
      <QueryState query={notices} label="notices">
        {(list) =>
          list.length === 0 ? (
            <p className="mt-6">No notice {state === 'new' ? 'is new' : 'matches'}.</p>
          ) : (
            <ScrollRegion label="Your notices">
              <table className="w-full border-collapse bg-surface text-sm">
                <caption className="pb-2 text-left text-base font-semibold">Your notices, newest first ({list.length})</caption>
                <thead>
                  <tr className="border-b-2 border-ink text-left">
                    <th scope="col" className="px-2 py-1.5">
                      Notice
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Kind
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Period
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Received
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      State
                    </th>
                    <th scope="col" className="px-2 py-1.5">
                      Flag
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {list.map((n) => (
                    <tr key={n.id} className={`border-b border-line align-top ${n.state === 'new' ? 'font-semibold' : ''}`}>
                      <th scope="row" className="px-2 py-1.5 text-left">
                        <Link to={paths.notice(n.id)} className="text-accent underline">
                          {n.subject}
                        </Link>
                      </th>
                      <td className="px-2 py-1.5">{n.kind ? noticeKindLabels[n.kind] : '—'}</td>
                      <td className="px-2 py-1.5">{periodWords(n.period, n.completeness)}</td>
                      <td className="px-2 py-1.5">{formatWhen(n.createdAt)}</td>
                      <td className="px-2 py-1.5">{n.state === 'new' ? 'New' : 'Read'}</td>
                      <td className="px-2 py-1.5">
                        <Link to={paths.flag(n.flagId)} className="text-accent underline">
                          Open the flag<span className="sr-only">: {n.subject}</span>
                        </Link>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>
          )
        }
      </QueryState>
    </section>
  );
}
