import type { IntakeSummary } from '@ratewarden/shared/intake-schemas';
import { roleMay } from '@ratewarden/shared/permissions';
import type { SessionUser } from '@ratewarden/shared/session';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { formatCount } from '../../lib/format';
import { useIntakes } from './api/get-intakes';
import { IntakeFormats } from './intake-formats';
import { IntakeStateBadge } from './intake-state-badge';
import { UploadPanel } from './upload-panel';

const col = createColumnHelper<IntakeSummary>();
const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—');

const columns = [
  col.accessor('fileName', {
    header: 'File',
    cell: (c) => (
      <Link className="text-accent underline" to={paths.intake(c.row.original.id)}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('kind', { header: 'Kind' }),
  col.accessor('state', { header: 'State', cell: (c) => <IntakeStateBadge state={c.getValue()} /> }),
  col.accessor((r) => (r.monthFrom ? `${r.monthFrom}${r.monthTo && r.monthTo !== r.monthFrom ? ` to ${r.monthTo}` : ''}` : ''), {
    id: 'months',
    header: 'Months',
  }),
  col.accessor('rowCount', { header: 'Rows', cell: (c) => formatCount(c.getValue()), meta: { numeric: true } }),
  col.accessor('problemCount', { header: 'Problems', cell: (c) => formatCount(c.getValue()), meta: { numeric: true } }),
  col.accessor('createdAt', { header: 'Received', cell: (c) => when(c.getValue()) }),
  col.accessor('submittedBy', { header: 'By', cell: (c) => c.getValue() ?? 'integration client' }),
];

export function IntakesPage({ user }: { user: SessionUser }) {
  const { data } = useIntakes({ offset: 0 });
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Intakes</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Rosters and case lists are checked row by row and applied whole, replacing an earlier version of the same site and month (kept as superseded), or
        rejected whole with every problem listed.
      </p>
      {/* The physician reads intakes (a roster check names the cases it would orphan to them) but does not upload. */}
      {roleMay(user.role, 'intake:write') && (
        <div className="mt-6">
          <UploadPanel />
        </div>
      )}
      <DataTable caption={`Intake history (${formatCount(data.total)})`} columns={columns} data={data.items} exportName="intakes" rowHeader="fileName" />
      <IntakeFormats />
    </section>
  );
}
