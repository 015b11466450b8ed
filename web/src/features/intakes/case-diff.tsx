import type { Role } from '@ratewarden/shared/domain';
import type { CaseDiffCell, IntakeDiff } from '@ratewarden/shared/intake-schemas';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '../../components/table/data-table';
import { formatCount } from '../../lib/format';
import { exportCount, showCount, smallCellThreshold } from '../../lib/small-cells';
import { useGroups } from '../../api/get-groups';

type CaseDiff = Extract<IntakeDiff, { kind: 'cases' }>;
type Row = CaseDiffCell & { group: string };

const statusWords: Record<CaseDiffCell['status'], string> = { suspected: 'suspected', confirmed: 'confirmed', ruled_out: 'ruled out' };

function columnsFor(role: Role | null) {
  const col = createColumnHelper<Row>();
  const count = (k: 'new' | 'changed', header: string) =>
    col.accessor((r) => r[k].count ?? -1, {
      id: k,
      header,
      cell: (c) => showCount(c.row.original[k].count, role, undefined, c.row.original[k].withheld).text,
      meta: { numeric: true, csv: (r) => exportCount(r[k].count, role, undefined, r[k].withheld) },
    });
  return [
    col.accessor('outcomeCode', { header: 'Outcome' }),
    col.accessor((r) => statusWords[r.status], { id: 'status', header: 'Status' }),
    col.accessor('group', { header: 'Exposure group' }),
    count('new', 'New cases'),
    count('changed', 'Changed cases'),
  ];
}

/**
 * What applying a case list changes: the file's totals, then the new and changed cases by
 * outcome, status and the exposure group of the roster row that attributes each case (a run's
 * attribution; "not rostered" when none does). Counts arrive as the API sends them: small ones
 * withheld for everyone but the physician, with the counts that would give them back.
 */
export function CaseDiffView({ diff, role, intakeId }: { diff: CaseDiff; role: Role | null; intakeId: string }) {
  const { data: groups } = useGroups();
  const groupName = (code: string | null) => (code === null ? 'not rostered' : (groups.find((g) => g.code === code)?.name ?? code));
  const rows: Row[] = (diff.split ?? []).map((c) => ({ ...c, group: groupName(c.groupCode) }));
  const withheld = rows.some((r) => r.new.withheld || r.changed.withheld) || diff.byOutcome.some((o) => o.newWithheld || o.changedWithheld);
  return (
    <section className="mt-6">
      <h2 className="text-lg font-semibold">What applying changes</h2>
      <p className="mt-1">
        {formatCount(diff.new)} new cases, {formatCount(diff.changed)} changed, {formatCount(diff.unchanged)} unchanged.
      </p>
      {diff.byOutcome.length > 0 && (
        <ul className="mt-1 text-sm">
          {diff.byOutcome.map((o) => (
            <li key={o.outcomeCode}>
              {o.outcomeCode}: {showCount(o.new, role, undefined, o.newWithheld ?? null).text} new,{' '}
              {showCount(o.changed, role, undefined, o.changedWithheld ?? null).text} changed
            </li>
          ))}
        </ul>
      )}
      {rows.length > 0 && (
        <DataTable
          caption="New and changed cases by outcome, status and exposure group"
          columns={columnsFor(role)}
          data={rows}
          exportName={`intake-${intakeId}-case-changes`}
          rowHeader="outcomeCode"
        />
      )}
      {withheld && (
        <p className="mt-2 text-xs text-ink-soft">
          Counts from 1 to {smallCellThreshold() - 1} are shown as “&lt;{smallCellThreshold()}”, and “withheld” marks a count kept back because with the totals
          beside it it would give a small one back; only the occupational physician sees them.
        </p>
      )}
    </section>
  );
}
