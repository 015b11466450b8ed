import { roleMay } from '@ratewarden/shared/permissions';
import type { RunDetail, RunSummary } from '@ratewarden/shared/runs';
import type { SessionUser } from '@ratewarden/shared/session';
import { useQueries, useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { StateTag, type Tone } from '../../components/status/state-tag';
import { DataTable } from '../../components/table/data-table';
import { formatDuration, formatWhen } from '../../lib/dates';
import { formatCount } from '../../lib/format';
import { PendingRunNote } from '../../components/status/pending-run-note';
import { formatMonth } from '../../lib/dates';
import { usePendingRun } from '../../api/get-pending-run';
import { runQueryOptions, useCurrentRun } from '../../api/get-run';
import { useOutcomes } from '../../api/get-outcomes';
import { UnattributedNote } from '../../components/data-quality/unattributed-note';
import { useSites } from '../../api/get-sites';
import { runsQueryOptions, useRuns } from './api/get-runs';
import { useRequestRun } from './api/request-run';
import { RunDiffPanel } from './run-diff-panel';

const stateTone: Record<RunSummary['state'], Tone> = { running: 'attention', succeeded: 'good', failed: 'alarm' };
const triggerLabels: Record<RunSummary['trigger'], string> = { schedule: 'nightly schedule', request: 'run button', cli: 'command line', bench: 'benchmark' };

type Row = RunSummary & { detail: RunDetail | undefined };
const col = createColumnHelper<Row>();
const columns = [
  col.accessor('number', {
    header: 'Run',
    cell: (c) => (
      <>
        #{c.getValue()}
        {c.row.original.isCurrent && (
          <span className="ml-2">
            <StateTag text="live" tone="good" />
          </span>
        )}
      </>
    ),
    meta: { numeric: true },
  }),
  col.accessor('startedAt', { header: 'Started', cell: (c) => formatWhen(c.getValue()) }),
  col.accessor('trigger', { header: 'Trigger', cell: (c) => triggerLabels[c.getValue()], meta: { csv: (r) => r.trigger } }),
  col.accessor((r) => (r.detail ? r.detail.inputs.rosterIntakeIds.length + r.detail.inputs.caseIntakeIds.length : -1), {
    id: 'intakes',
    header: 'Intakes included',
    cell: (c) =>
      c.row.original.detail
        ? `${formatCount(c.row.original.detail.inputs.rosterIntakeIds.length)} roster, ${formatCount(c.row.original.detail.inputs.caseIntakeIds.length)} case list`
        : '…',
    meta: { csv: (r) => (r.detail ? `${r.detail.inputs.rosterIntakeIds.length} roster; ${r.detail.inputs.caseIntakeIds.length} case list` : null) },
  }),
  col.accessor((r) => (r.finishedAt ? new Date(r.finishedAt).getTime() - new Date(r.startedAt).getTime() : -1), {
    id: 'duration',
    header: 'Duration',
    cell: (c) => formatDuration(c.row.original.startedAt, c.row.original.finishedAt),
    meta: { numeric: true, csv: (r) => formatDuration(r.startedAt, r.finishedAt) },
  }),
  col.accessor('state', { header: 'Outcome', cell: (c) => <StateTag text={c.getValue()} tone={stateTone[c.getValue()]} />, meta: { csv: (r) => r.state } }),
  col.accessor((r) => r.settingsVersion ?? -1, {
    id: 'settings',
    header: 'Analysis settings',
    cell: (c) => (c.row.original.settingsVersion === null ? '—' : `version ${c.row.original.settingsVersion}`),
    meta: { numeric: true, csv: (r) => r.settingsVersion },
  }),
  col.accessor('resultCount', { header: 'Results', cell: (c) => (c.getValue() === null ? '—' : formatCount(c.getValue()!)), meta: { numeric: true } }),
  col.accessor((r) => r.error ?? r.reason ?? '', {
    id: 'note',
    header: 'Reason or error',
    cell: (c) => <span className={c.row.original.error ? 'text-alarm' : ''}>{c.getValue() || '—'}</span>,
  }),
];

/** The run button: after a request, the list polls until the worker has picked it up and finished. */
function RunNow({ onRequested }: { onRequested: (at: string) => void }) {
  const request = useRequestRun();
  return (
    <div className="mt-4 flex flex-wrap items-center gap-3">
      <button
        type="button"
        disabled={request.isPending}
        onClick={() => request.mutate(undefined, { onSuccess: (r) => onRequested(r.requestedAt) })}
        className="btn btn-primary px-4 py-2"
      >
        {request.isPending ? 'Asking …' : 'Run now'}
      </button>
      <span className="text-sm text-ink-soft">The worker picks the request up within seconds; the figures switch when the run has succeeded.</span>
      {request.isError && <ProblemNotice title="The run was not requested" problem={problemOf(request.error).problem} />}
    </div>
  );
}

/** The latest complete month of the live figures (shared/src/periods.ts): company-wide and per site. */
function CompleteThrough({ run }: { run: RunDetail | null }) {
  const { data: sites } = useSites();
  const ct = run?.completeThrough;
  if (!run || !ct) return null;
  const name = (id: number) => sites.find((s) => s.id === id)?.name ?? `site ${id}`;
  const month = (m: string | null) => (m ? formatMonth(m) : 'no complete month');
  return (
    <p className="mt-3 text-sm">
      Run #{run.number} (live) read complete months
      {ct.company !== null && (
        <>
          {' '}
          through <strong>{month(ct.company)}</strong> for all sites together
        </>
      )}
      {ct.sites.length > 0 && (
        <>
          {ct.company !== null ? '; by site: ' : ': '}
          {ct.sites.map((s) => `${name(s.siteId)} ${month(s.month)}`).join(', ')}
        </>
      )}
      . Later months are partial: their roster or case list was not in.
    </p>
  );
}

export function RunsPage({ user }: { user: SessionUser }) {
  useRuns();
  const [requestedAt, setRequestedAt] = useState<string | null>(null);
  const pending = usePendingRun();
  const { data: current } = useCurrentRun();
  const { data: outcomes } = useOutcomes();
  // Poll while a requested run has not finished yet, or while one is running.
  const runs = useQuery({
    ...runsQueryOptions(),
    refetchInterval: (q) => {
      const data = q.state.data ?? [];
      if (data.some((r) => r.state === 'running')) return 2_000;
      if (requestedAt && !data.some((r) => r.finishedAt && r.startedAt >= requestedAt)) return 2_000;
      if (pending.data?.pending) return 5_000;
      return false;
    },
  });
  const list = runs.data ?? [];
  const details = useQueries({ queries: list.slice(0, 25).map((r) => ({ ...runQueryOptions(r.id), staleTime: r.state === 'running' ? 0 : Infinity })) });
  const rows: Row[] = list.map((r, i) => ({ ...r, detail: details[i]?.data }));
  const finishedRequest = requestedAt ? list.find((r) => r.finishedAt && r.startedAt >= requestedAt) : undefined;
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Run history</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Every night, and whenever the hygienist asks, a run recomputes every rate from the applied intakes. A run either succeeds whole and becomes the live
        figures, or fails and leaves the previous ones live.
      </p>
      {roleMay(user.role, 'runs:trigger') && <RunNow onRequested={setRequestedAt} />}
      <PendingRunNote pending={pending.data?.pending} />
      <CompleteThrough run={current} />
      <UnattributedNote run={current} outcomes={outcomes} role={user.role} />
      {requestedAt && (
        <p role="status" className="mt-2 text-sm font-medium">
          {finishedRequest
            ? `Run #${finishedRequest.number} ${finishedRequest.state === 'succeeded' ? 'has finished' : 'failed'} (${formatDuration(finishedRequest.startedAt, finishedRequest.finishedAt)}).`
            : 'Run requested; waiting for the worker …'}
        </p>
      )}
      <DataTable caption={`Runs (${list.length}, newest first)`} columns={columns} data={rows} exportName="runs" />
      <RunDiffPanel runs={list.filter((r) => r.state === 'succeeded')} role={user.role} />
    </section>
  );
}
