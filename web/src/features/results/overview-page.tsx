import { StateTag } from '../../components/status/state-tag';
import { roleMay } from '@ratewarden/shared/permissions';
import type { SessionUser } from '@ratewarden/shared/session';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { formatMonth, formatWhen } from '../../lib/dates';
import { formatAmount, formatCount, formatEstimate } from '../../lib/format';
import { flagsQueryOptions } from '../../api/get-flags';
import type { ResultsContext } from './results-frame';
import { ResultsFrame } from './results-frame';
import { personTimeUnit, rateUnit } from './results-units';
import { shownResult, type ShownResult } from './shown-result';
import { PARTIAL_SHAPE, partialSuffix } from './partial-period';
import { SummaryCard } from './summary-card';

interface Row {
  group: string;
  reference: boolean;
  shown: ShownResult;
  months: number;
  completeness: 'complete' | 'partial';
}

function columns(unit: string, ptUnit: string) {
  const col = createColumnHelper<Row>();
  return [
    col.accessor('group', {
      header: 'Exposure group',
      cell: (c) => (
        <>
          {c.getValue()}
          {c.row.original.reference && (
            <span className="ml-2">
              <StateTag text="reference" tone="good" />
            </span>
          )}
        </>
      ),
    }),
    col.accessor((r) => r.shown.cases.value ?? -1, {
      id: 'cases',
      header: 'Cases',
      cell: (c) => c.row.original.shown.cases.text,
      meta: { numeric: true, csv: (r) => (r.shown.cases.suppressed ? r.shown.cases.text : r.shown.cases.value) },
    }),
    col.accessor((r) => r.shown.personTime, { id: 'pt', header: `Person-time (${ptUnit})`, cell: (c) => formatAmount(c.getValue()), meta: { numeric: true } }),
    col.accessor((r) => r.shown.rate ?? -1, {
      id: 'rate',
      header: `Rate ${unit}`,
      cell: (c) => (c.row.original.shown.hidden ? 'not shown' : formatEstimate(c.row.original.shown.rate)),
      meta: { numeric: true, csv: (r) => r.shown.rate },
    }),
    col.accessor((r) => r.shown.rateLower ?? -1, {
      id: 'lower',
      header: 'Lower limit',
      cell: (c) => (c.row.original.shown.hidden ? '—' : formatEstimate(c.row.original.shown.rateLower)),
      meta: { numeric: true, csv: (r) => r.shown.rateLower },
    }),
    col.accessor((r) => r.shown.rateUpper ?? -1, {
      id: 'upper',
      header: 'Upper limit',
      cell: (c) => (c.row.original.shown.hidden ? '—' : formatEstimate(c.row.original.shown.rateUpper)),
      meta: { numeric: true, csv: (r) => r.shown.rateUpper },
    }),
    col.accessor('months', { header: 'Months with data', meta: { numeric: true } }),
    col.accessor('completeness', {
      header: 'Period',
      cell: (c) =>
        c.getValue() === 'partial' ? (
          <>
            <span aria-hidden="true">{PARTIAL_SHAPE} </span>partial
          </>
        ) : (
          'complete'
        ),
    }),
  ];
}

function OverviewBody({ ctx }: { ctx: ResultsContext }) {
  const { run, outcome, results, period, groupName, user } = ctx;
  const flags = useQuery(flagsQueryOptions({ outcomeId: outcome.id }));
  const rows: Row[] = results
    .filter((r) => r.window === 'rolling12' && r.period === period)
    .map((r) => ({
      group: groupName(r.exposureGroupId),
      reference: r.isReference,
      shown: shownResult(r, user.role),
      months: r.monthsCovered,
      completeness: r.completeness,
    }));
  const raised = flags.data?.filter((f) => f.state === 'raised').length;
  const inReview = flags.data?.filter((f) => f.state === 'in_review').length;
  const unit = rateUnit(run.settings);
  return (
    <>
      <dl className="mt-6 grid gap-4 sm:grid-cols-3">
        <SummaryCard
          title={`Flags raised (${outcome.name})`}
          summary={{
            count: raised,
            failed: flags.isError,
            none: 'No flags waiting for review',
            some: (n) => `${n} ${n === 1 ? 'flag' : 'flags'} waiting for review`,
            tone: 'alarm',
          }}
        />
        <SummaryCard
          title="Flags in review"
          summary={{ count: inReview, failed: flags.isError, none: 'None in review', some: (n) => `${n} in review`, tone: 'attention' }}
        >
          <dd className="mt-1 text-sm">
            <Link className="text-accent underline" to={`${paths.flags}?outcome=${outcome.id}`}>
              Open the flags
            </Link>
          </dd>
        </SummaryCard>
        <div className="card px-4 py-3">
          <dt className="text-sm text-ink-soft">Last run finished</dt>
          <dd className="text-lg font-semibold">{formatWhen(run.finishedAt)}</dd>
          <dd className="mt-1 text-sm">
            Run {run.number} over {formatCount(run.inputs.rosterIntakeIds.length)} roster and {formatCount(run.inputs.caseIntakeIds.length)} case-list intakes
            {roleMay(user.role, 'intake:read') && (
              <>
                {' '}
                ·{' '}
                <Link className="text-accent underline" to={paths.intakes}>
                  intakes
                </Link>
              </>
            )}
          </dd>
        </div>
      </dl>
      <DataTable
        caption={`Rolling 12-month rate per exposure group, twelve months ending ${period ? formatMonth(period) : '—'}${partialSuffix(rows.some((r) => r.completeness === 'partial'))} (${unit}, ${Math.round(run.settings.confidence * 100)}% interval)`}
        columns={columns(unit, personTimeUnit(run.settings))}
        data={rows}
        exportName={`overview-${outcome.code}-${period ?? 'none'}`}
        rowHeader="group"
      />
    </>
  );
}

export function OverviewPage({ user }: { user: SessionUser }) {
  return (
    <ResultsFrame
      title="Overview"
      intro="The current rolling 12-month rate of each exposure group with its interval, the flags waiting for review and the run the figures come from."
      user={user}
      fixedWindow="rolling12"
    >
      {(ctx) => <OverviewBody ctx={ctx} />}
    </ResultsFrame>
  );
}
