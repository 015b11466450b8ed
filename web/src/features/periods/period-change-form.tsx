import { isCompleteState, periodStateLabels, type SitePeriod } from '@ratewarden/shared/periods';
import { useEffect, useId, useRef, useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { formatMonth } from '../../lib/dates';
import { useClosePeriod } from './api/close-period';
import { useReopenPeriod } from './api/reopen-period';

/**
 * The hygienist's confirmation of closing or reopening one site × month. Closing a month with its
 * roster or case list missing says nothing more will come for it, so it needs a reason (the
 * server refuses it otherwise); reopening always does. Escape or Cancel leaves it unchanged.
 */
export function PeriodChangeForm({
  period,
  siteName,
  onDone,
  onCancel,
}: {
  period: SitePeriod;
  siteName: string;
  onDone: (message: string) => void;
  onCancel: () => void;
}) {
  const closing = period.state !== 'closed';
  const forced = closing && !isCompleteState(period.state);
  const reasonNeeded = !closing || forced;
  const close = useClosePeriod();
  const reopen = useReopenPeriod();
  const mutation = closing ? close : reopen;
  const [reason, setReason] = useState('');
  const [tried, setTried] = useState(false);
  const heading = useRef<HTMLHeadingElement>(null);
  const ids = useId();
  useEffect(() => heading.current?.focus(), []);
  const what = `${siteName}, ${formatMonth(period.month)}`;
  const missing = tried && reasonNeeded && reason.trim().length < 3;

  function submit() {
    setTried(true);
    if (reasonNeeded && reason.trim().length < 3) return;
    const month = period.month.slice(0, 7);
    const text = reason.trim() || undefined;
    if (closing) close.mutate({ siteId: period.siteId, month, reason: text, force: forced }, { onSuccess: () => onDone(`${what} is closed.`) });
    else reopen.mutate({ siteId: period.siteId, month, reason: text! }, { onSuccess: () => onDone(`${what} is open again.`) });
  }

  return (
    <form
      aria-labelledby={`${ids}-h`}
      className="no-print mt-4 max-w-2xl border border-ink bg-surface p-4"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
      onKeyDown={(e) => {
        if (e.key === 'Escape') onCancel();
      }}
    >
      <h2 id={`${ids}-h`} ref={heading} tabIndex={-1} className="text-xl font-semibold">
        {closing ? 'Close' : 'Reopen'} {what}
      </h2>
      <p className="mt-1 text-sm">Now: {periodStateLabels[period.state]}.</p>
      {closing && !forced && (
        <p className="mt-2 text-sm">Roster and case list are both in. A closed month still takes corrections, and the calendar marks them.</p>
      )}
      {forced && (
        <p className="mt-2 note note-watch px-3 py-2 text-sm">
          <span aria-hidden="true">⚠ </span>
          {period.state === 'hours_in'
            ? 'No case list reports this month yet.'
            : period.state === 'cases_in'
              ? 'The roster of this month is not in.'
              : 'Nothing has been received for this month.'}{' '}
          Closing it says nothing more will come: the month then counts as complete in the results and the watch rules. Say why.
        </p>
      )}
      {!closing && <p className="mt-2 text-sm">The month goes back to what has been received; say why it is reopened.</p>}
      <div className="mt-3 flex flex-col gap-1">
        <label htmlFor={`${ids}-reason`} className="text-sm font-medium">
          Reason{reasonNeeded ? '' : ' (optional)'}
        </label>
        <textarea
          id={`${ids}-reason`}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          rows={2}
          maxLength={500}
          aria-invalid={missing ? true : undefined}
          aria-describedby={missing ? `${ids}-missing` : undefined}
          className="field px-2 py-1.5"
        />
      </div>
      {missing && (
        <p id={`${ids}-missing`} role="alert" className="mt-2 text-sm text-alarm">
          <span aria-hidden="true">⚠ </span>Write a reason of a few words first.
        </p>
      )}
      {mutation.isError && (
        <div className="mt-3">
          <ProblemNotice title={closing ? 'The month was not closed' : 'The month was not reopened'} problem={problemOf(mutation.error).problem} />
        </div>
      )}
      <div className="mt-3 flex flex-wrap gap-3">
        <button type="submit" disabled={mutation.isPending} className="btn btn-primary px-4 py-2">
          {mutation.isPending ? 'Saving …' : closing ? 'Close the month' : 'Reopen the month'}
        </button>
        <button type="button" onClick={onCancel} className="btn btn-quiet px-4 py-2">
          Cancel
        </button>
      </div>
    </form>
  );
}
