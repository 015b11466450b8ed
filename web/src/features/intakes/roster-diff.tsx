import type { Role } from '@ratewarden/shared/domain';
import type { IntakeDiff, OrphanedCase, RosterSliceDiff } from '@ratewarden/shared/intake-schemas';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../components/table/data-table';
import { formatAmount, formatCount } from '../../lib/format';
import { showCount } from '../../lib/small-cells';

type RosterDiff = Extract<IntakeDiff, { kind: 'roster' }>;

const scol = createColumnHelper<RosterSliceDiff>();
const sliceColumns = [
  scol.accessor((s) => `${s.siteCode} ${s.month}`, { id: 'slice', header: 'Site and month' }),
  scol.accessor((s) => (s.stored ? 'replaces the stored version' : 'new'), { id: 'stored', header: 'Effect' }),
  scol.accessor('added', { header: 'Workers added', meta: { numeric: true } }),
  scol.accessor('removed', { header: 'Removed', meta: { numeric: true } }),
  scol.accessor('moved', { header: 'Moved group', meta: { numeric: true } }),
  scol.accessor('hoursChanged', { header: 'Hours changed', meta: { numeric: true } }),
  scol.accessor('unchanged', { header: 'Unchanged', meta: { numeric: true } }),
  scol.accessor('storedHours', { header: 'Hours stored', cell: (c) => formatAmount(c.getValue()), meta: { numeric: true } }),
  scol.accessor('newHours', { header: 'Hours in file', cell: (c) => formatAmount(c.getValue()), meta: { numeric: true } }),
];

const ocol = createColumnHelper<OrphanedCase>();
const orphanColumns = [
  ocol.accessor('caseRef', { header: 'Case' }),
  ocol.accessor('workerKey', { header: 'Worker (pseudonym)' }),
  ocol.accessor('outcomeCode', { header: 'Outcome' }),
  ocol.accessor('onsetDate', { header: 'Onset' }),
  ocol.accessor('status', { header: 'Status' }),
  ocol.accessor((c) => `${c.siteCode} ${c.month}`, { id: 'row', header: 'Roster row it loses' }),
];

const kinds = [
  ['added', 'Added'],
  ['removed', 'Removed'],
  ['moved', 'Moved to another group'],
  ['hoursChanged', 'Hours changed'],
] as const;

/** The workers of one replaced site × month, by kind of change (pseudonymous keys, the first 200 of each). */
function SliceWorkers({ slice }: { slice: RosterSliceDiff }) {
  const named = slice.workers;
  if (!named || kinds.every(([k]) => named[k].length === 0)) return null;
  return (
    <div className="mt-3">
      <h4 className="font-semibold">
        {slice.siteCode} {slice.month}
      </h4>
      <dl className="mt-1 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[12rem_1fr]">
        {kinds
          .filter(([k]) => slice[k] > 0)
          .map(([k, label]) => (
            <div key={k} className="contents">
              <dt className="text-ink-soft">
                {label} ({formatCount(slice[k])}
                {named[k].length < slice[k] ? `, the first ${formatCount(named[k].length)} named` : ''})
              </dt>
              <dd className="break-words font-mono text-xs">{named[k].join(', ')}</dd>
            </div>
          ))}
      </dl>
    </div>
  );
}

/** Stored cases the roster would leave without a roster row: a count for everyone, the cases for the physician. */
function Orphans({ diff, role, intakeId }: { diff: RosterDiff; role: Role | null; intakeId: string }) {
  const o = diff.orphanedCases;
  if (!o || o.count === 0) return null;
  const n = showCount(o.count, role, undefined, o.withheld).text;
  return (
    <div role="alert" className="mt-4 note note-alarm px-4 py-3">
      <p className="font-semibold">
        Applying this roster leaves {n} stored {o.count === 1 ? 'case' : 'cases'} without a roster row
      </p>
      <p className="mt-1 text-sm">
        The roster row each case is attributed to (its worker's row in the onset month, moved back by the outcome's exposure lag) is not in the new version, and
        no other site's roster has one. Runs will count {o.count === 1 ? 'it' : 'them'} as not attributed, removed by a correction, until a roster gives{' '}
        {o.count === 1 ? 'it' : 'them'} a row again.
      </p>
      {o.cases && o.cases.length > 0 && (
        <DataTable
          caption={`Cases that would lose their roster row (${o.cases.length < (o.count ?? 0) ? `the first ${formatCount(o.cases.length)} of ${formatCount(o.count ?? 0)}` : formatCount(o.cases.length)}; shown to the occupational physician only)`}
          columns={orphanColumns}
          data={o.cases}
          exportName={`intake-${intakeId}-orphaned-cases`}
          rowHeader="caseRef"
        />
      )}
    </div>
  );
}

/** What applying a roster changes: site-months, the workers named by kind of change, and the stored cases it would orphan. */
export function RosterDiffView({ diff, role, intakeId }: { diff: RosterDiff; role: Role | null; intakeId: string }) {
  return (
    <section className="mt-6">
      <h2 className="text-lg font-semibold">What applying changes</h2>
      <p className="mt-1">
        {formatCount(diff.totals.newSlices)} new and {formatCount(diff.totals.replacedSlices)} replaced site-months; {formatCount(diff.newWorkers)} workers not
        seen before.
      </p>
      <Orphans diff={diff} role={role} intakeId={intakeId} />
      <DataTable caption="Changes by site and month" columns={sliceColumns} data={diff.slices} exportName={`intake-${intakeId}-changes`} rowHeader="slice" />
      {diff.slices.some((s) => s.stored && s.workers) && (
        <section className="mt-4">
          <h3 className="text-base font-semibold">Workers changed in the replaced site-months</h3>
          <p className="text-sm text-ink-soft">Pseudonymous worker keys, as in the file. A new site-month adds every worker in it.</p>
          {diff.slices
            .filter((s) => s.stored)
            .map((s) => (
              <SliceWorkers key={`${s.siteCode} ${s.month}`} slice={s} />
            ))}
        </section>
      )}
    </section>
  );
}
