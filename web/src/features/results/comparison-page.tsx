import { StateTag } from '../../components/status/state-tag';
import type { SessionUser } from '@ratewarden/shared/session';
import { METHODS } from '@ratewarden/shared/stats/methods';
import { createColumnHelper } from '@tanstack/react-table';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { DataTable } from '../../components/table/data-table';
import { formatAmount, formatEstimate, formatP } from '../../lib/format';
import { ResultsFrame, type ResultsContext } from './results-frame';
import { personTimeUnit, rateUnit } from './results-units';
import { shownResult, type ShownResult } from './shown-result';
import { PARTIAL_SHAPE, partialSuffix } from './partial-period';
import { windowPeriodText } from './window-text';

interface Row {
  group: string;
  reference: boolean;
  s: ShownResult;
  completeness: 'complete' | 'partial';
}

const withInterval = (h: boolean, e: number | null, l: number | null, u: number | null) =>
  h ? 'not shown' : `${formatEstimate(e)} (${formatEstimate(l)} to ${formatEstimate(u)})`;
const sortable = (x: number | null) => (x === null ? -Infinity : x);

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
    col.accessor((r) => r.s.cases.value ?? -1, {
      id: 'cases',
      header: 'Cases',
      cell: (c) => c.row.original.s.cases.text,
      meta: { numeric: true, csv: (r) => (r.s.cases.suppressed ? r.s.cases.text : r.s.cases.value) },
    }),
    col.accessor((r) => r.s.personTime, { id: 'pt', header: `Person-time (${ptUnit})`, cell: (c) => formatAmount(c.getValue()), meta: { numeric: true } }),
    col.accessor((r) => sortable(r.s.rate), {
      id: 'rate',
      header: `Rate ${unit} (interval)`,
      cell: (c) => withInterval(c.row.original.s.hidden, c.row.original.s.rate, c.row.original.s.rateLower, c.row.original.s.rateUpper),
      meta: { numeric: true, csv: (r) => withInterval(r.s.hidden, r.s.rate, r.s.rateLower, r.s.rateUpper) },
    }),
    col.accessor((r) => sortable(r.s.irr), {
      id: 'irr',
      header: 'IRR (interval)',
      cell: (c) =>
        c.row.original.reference
          ? '1 (reference)'
          : withInterval(c.row.original.s.comparisonHidden, c.row.original.s.irr, c.row.original.s.irrLower, c.row.original.s.irrUpper),
      meta: { numeric: true, csv: (r) => (r.reference ? '1 (reference)' : withInterval(r.s.comparisonHidden, r.s.irr, r.s.irrLower, r.s.irrUpper)) },
    }),
    col.accessor((r) => sortable(r.s.irrP), {
      id: 'irrP',
      header: 'p (IRR = 1)',
      cell: (c) => (c.row.original.reference ? '—' : c.row.original.s.comparisonHidden ? 'not shown' : formatP(c.row.original.s.irrP)),
      meta: { numeric: true, csv: (r) => r.s.irrP },
    }),
    col.accessor((r) => sortable(r.s.ird), {
      id: 'ird',
      header: `IRD ${unit} (interval)`,
      cell: (c) =>
        c.row.original.reference
          ? '0 (reference)'
          : withInterval(c.row.original.s.comparisonHidden, c.row.original.s.ird, c.row.original.s.irdLower, c.row.original.s.irdUpper),
      meta: { numeric: true, csv: (r) => (r.reference ? '0 (reference)' : withInterval(r.s.comparisonHidden, r.s.ird, r.s.irdLower, r.s.irdUpper)) },
    }),
    col.accessor((r) => sortable(r.s.irdP), {
      id: 'irdP',
      header: 'p (IRD = 0)',
      cell: (c) => (c.row.original.reference ? '—' : c.row.original.s.comparisonHidden ? 'not shown' : formatP(c.row.original.s.irdP)),
      meta: { numeric: true, csv: (r) => r.s.irdP },
    }),
    col.accessor(() => `IRR ${METHODS.irrExact.split(' (')[0]}, p ${METHODS.pExact}; IRD ${METHODS.irdWald}`, {
      id: 'method',
      header: 'Interval method',
      enableSorting: false,
      cell: (c) => <span className="text-xs">{c.getValue()}</span>,
    }),
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

function ComparisonBody({ ctx }: { ctx: ResultsContext }) {
  const { results, filters, period, groupName, outcome, run } = ctx;
  const rows: Row[] = results
    .filter((r) => r.window === filters.window && r.period === period)
    .map((r) => ({ group: groupName(r.exposureGroupId), reference: r.isReference, s: shownResult(r, ctx.user.role), completeness: r.completeness }));
  const unit = rateUnit(run.settings);
  const pct = Math.round(run.settings.confidence * 100);
  const partial = rows.some((r) => r.completeness === 'partial');
  const when = `${period ? windowPeriodText(filters.window, period, run.settings) : '—'}${partialSuffix(partial)}`;
  const refName = rows.find((r) => r.reference)?.group;
  const items = rows.map((r) => ({
    label: r.group,
    estimate: r.reference ? 1 : r.s.irr,
    lower: r.reference ? null : r.s.irrLower,
    upper: r.reference ? null : r.s.irrUpper,
    reference: r.reference,
  }));
  return (
    <>
      <p className="mt-4 text-sm">
        Each group against the reference group <strong>{refName ?? '(none set)'}</strong>, {when}. A diamond marks the reference; a group whose count, or the
        reference group's, is withheld has no point.
      </p>
      <IntervalPlot
        title={`${outcome.name}: incidence rate ratio against ${refName ?? 'the reference'} with ${pct}% exact intervals`}
        items={items}
        csv={{
          name: `irr-${outcome.code}-${filters.window}-${period}`,
          header: ['Exposure group', 'IRR', 'Lower limit', 'Upper limit', 'Period'],
          rows: items.map((i) => [i.label, i.estimate, i.lower, i.upper, partial ? 'partial' : 'complete']),
        }}
      />
      <DataTable
        caption={`Comparison with the reference group, ${when} (${pct}% intervals)`}
        columns={columns(unit, personTimeUnit(run.settings))}
        data={rows}
        exportName={`comparison-${outcome.code}-${filters.window}-${period}`}
        rowHeader="group"
      />
    </>
  );
}

export function ComparisonPage({ user }: { user: SessionUser }) {
  return (
    <ResultsFrame
      title="Group comparison"
      intro="Every exposure group's incidence rate ratio (IRR) and rate difference (IRD) against the reference group, with their intervals and tests."
      user={user}
    >
      {(ctx) => <ComparisonBody ctx={ctx} />}
    </ResultsFrame>
  );
}
