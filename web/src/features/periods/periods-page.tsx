import { ScrollRegion } from '../../components/table/scroll-region';
import { roleMay } from '@ratewarden/shared/permissions';
import { addMonths } from '@ratewarden/shared/months';
import { periodStateLabels, periodStates, type SitePeriod } from '@ratewarden/shared/periods';
import type { SessionUser } from '@ratewarden/shared/session';
import { useState } from 'react';
import { useSearchParams } from 'react-router';
import { QueryState } from '../../components/feedback/query-state';
import { PendingRunNote } from '../../components/status/pending-run-note';
import { formatMonth, formatWhen } from '../../lib/dates';
import { usePendingRun } from '../../api/get-pending-run';
import { usePeriodCalendar } from '../../api/get-period-calendar';
import { PeriodChangeForm } from './period-change-form';
import { StatusShape, toneTint } from '../../components/status/status-shape';
import { CORRECTED_SHAPE, CORRECTED_TEXT, periodStateShapes, periodStateTones } from './period-shapes';

const SHIFT = 12;

function Legend() {
  return (
    <ul aria-label="What the calendar shows" className="mt-4 flex flex-wrap gap-x-6 gap-y-1 text-sm">
      {periodStates.map((s) => (
        <li key={s} className="flex items-center gap-1.5">
          <StatusShape shape={periodStateShapes[s]} tone={periodStateTones[s]} />
          {periodStateLabels[s]}
        </li>
      ))}
      <li>
        <span aria-hidden="true" className="mr-1">
          {CORRECTED_SHAPE}
        </span>
        {CORRECTED_TEXT}
      </li>
    </ul>
  );
}

function Cell({ period, siteName, mayClose, onChange }: { period: SitePeriod; siteName: string; mayClose: boolean; onChange: () => void }) {
  const label = periodStateLabels[period.state];
  return (
    <td className="px-2 py-1.5 align-top">
      <span className="flex flex-wrap items-center gap-x-2">
        <span className={`inline-flex items-center gap-1.5 rounded-full px-2.5 py-0.5 font-medium ${toneTint[periodStateTones[period.state]]}`}>
          <StatusShape shape={periodStateShapes[period.state]} tone={periodStateTones[period.state]} />
          {label}
        </span>
        {mayClose && (
          <button type="button" onClick={onChange} className="no-print text-xs font-medium text-accent underline">
            {period.state === 'closed' ? 'Reopen…' : 'Close…'}
            <span className="sr-only">
              {' '}
              {siteName}, {formatMonth(period.month)}
            </span>
          </button>
        )}
      </span>
      {period.state === 'closed' && period.closedAt && (
        <span className="block text-xs text-ink-soft">
          {period.closedBy ? `by ${period.closedBy}, ` : ''}
          {formatWhen(period.closedAt)}
        </span>
      )}
      {period.correctedAfterClose && (
        <span className="block text-xs font-semibold">
          <span aria-hidden="true">{CORRECTED_SHAPE} </span>
          {CORRECTED_TEXT}
        </span>
      )}
    </td>
  );
}

/**
 * Reporting periods: every site × month with what has been received (shared/src/periods.ts
 * decides the state), newest month first; the hygienist closes and reopens months here.
 */
export function PeriodsPage({ user }: { user: SessionUser }) {
  const [params, setParams] = useSearchParams();
  const to = params.get('to') ?? undefined;
  const calendar = usePeriodCalendar(to ? { to } : {});
  const pending = usePendingRun();
  const mayClose = roleMay(user.role, 'periods:close');
  const [editing, setEditing] = useState<SitePeriod | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const shift = (months: number) => {
    const end = calendar.data?.to;
    if (!end) return;
    setEditing(null);
    setParams((p) => {
      const next = new URLSearchParams(p);
      next.set('to', addMonths(end, months).slice(0, 7));
      return next;
    });
  };
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Reporting periods</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Each month of each site, from nothing received to roster and case list both in. A month counts as complete when both are in, or when the hygienist has
        closed it; results mark the periods that are not, and watch rules look at complete periods only.
        {mayClose ? ' Close a month once nothing more is expected for it; a closed month still takes corrections, and they are marked.' : ''}
      </p>
      <Legend />
      <PendingRunNote pending={pending.data?.pending} />
      <div aria-live="polite">
        {done && (
          <p role="status" className="mt-3 note note-ok px-4 py-2">
            {done} A run is requested, so the results say which periods are complete.
          </p>
        )}
      </div>
      <div className="no-print mt-4 flex flex-wrap gap-3">
        <button type="button" onClick={() => shift(-SHIFT)} className="btn btn-quiet px-3 py-1.5 text-sm">
          Earlier months
        </button>
        <button type="button" onClick={() => shift(SHIFT)} className="btn btn-quiet px-3 py-1.5 text-sm">
          Later months
        </button>
      </div>
      <QueryState query={calendar} label="reporting periods">
        {(data) => {
          const siteName = (id: number) => data.sites.find((s) => s.id === id)?.name ?? `site ${id}`;
          const cell = (siteId: number, month: string) => data.periods.find((p) => p.siteId === siteId && p.month === month)!;
          return (
            <>
              {editing && (
                <PeriodChangeForm
                  key={`${editing.siteId}|${editing.month}`}
                  period={cell(editing.siteId, editing.month) ?? editing}
                  siteName={siteName(editing.siteId)}
                  onCancel={() => setEditing(null)}
                  onDone={(message) => {
                    setEditing(null);
                    setDone(message);
                  }}
                />
              )}
              {data.sites.length === 0 ? (
                <p className="mt-4">No site is assigned to you; an administrator assigns sites.</p>
              ) : (
                <ScrollRegion label="Reporting periods, sites by months">
                  <table className="w-full border-collapse bg-surface text-sm">
                    <caption className="pb-2 text-left text-base font-semibold">
                      Sites × months, {formatMonth(data.from)} to {formatMonth(data.to)}, newest first
                    </caption>
                    <thead>
                      <tr className="border-b-2 border-ink text-left">
                        <th scope="col" className="px-2 py-1.5">
                          Month
                        </th>
                        {data.sites.map((s) => (
                          <th key={s.id} scope="col" className="px-2 py-1.5">
                            {s.name}
                          </th>
                        ))}
                      </tr>
                    </thead>
                    <tbody>
                      {[...data.months].reverse().map((m) => (
                        <tr key={m} className="border-b border-line">
                          <th scope="row" className="whitespace-nowrap px-2 py-1.5 text-left font-medium">
                            {formatMonth(m)}
                          </th>
                          {data.sites.map((s) => (
                            <Cell
                              key={s.id}
                              period={cell(s.id, m)}
                              siteName={s.name}
                              mayClose={mayClose}
                              onChange={() => {
                                setDone(null);
                                setEditing(cell(s.id, m));
                              }}
                            />
                          ))}
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </ScrollRegion>
              )}
            </>
          );
        }}
      </QueryState>
    </section>
  );
}
