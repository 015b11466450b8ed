import { unattributedReasonText, type UnattributedCase } from '@ratewarden/shared/unattributed';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { useOutcomes } from '../../api/get-outcomes';
import { useUnattributed } from './api/get-unattributed';

type Row = UnattributedCase & { outcome: string; why: string };
const col = createColumnHelper<Row>();
const columns = [
  col.accessor('caseRef', { header: 'Case' }),
  col.accessor('workerKey', { header: 'Worker (pseudonym)' }),
  col.accessor('outcome', { header: 'Outcome' }),
  col.accessor('onsetDate', { header: 'Onset' }),
  col.accessor('status', { header: 'Status' }),
  col.accessor('why', { header: 'Why no roster row attributes it', meta: { csv: (r) => r.reason } }),
];

/**
 * The physician's list of the live run's counted cases that no roster row attributes, with the
 * reason for each (the server refuses every other role and records each opening).
 */
export function UnattributedPage() {
  const { data } = useUnattributed();
  const { data: outcomes } = useOutcomes();
  const rows: Row[] = (data?.cases ?? []).map((c) => ({
    ...c,
    outcome: outcomes.find((o) => o.id === c.outcomeId)?.name ?? `outcome ${c.outcomeId}`,
    why: unattributedReasonText[c.reason],
  }));
  return (
    <section>
      <p className="text-sm">
        <Link to={paths.runs} className="text-accent underline">
          ← Run history
        </Link>
      </p>
      <h1 className="mt-2 text-2xl font-bold tracking-tight">Cases not attributed</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Cases the live run counts but cannot place in any exposure group: no roster row with hours holds the worker in the onset month (moved back by the
        outcome's exposure lag). They are in no group's figures until a roster gives them one, or the case is corrected.
      </p>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        Confidential medical information, shown to the occupational physician only; every opening of this list is recorded.
      </p>
      {data === null ? (
        <p className="mt-6">No run has finished yet.</p>
      ) : (
        <DataTable
          caption={`Unattributed cases in run #${data.runNumber} (${rows.length})`}
          columns={columns}
          data={rows}
          exportName={`run-${data.runNumber}-unattributed`}
          rowHeader="caseRef"
        />
      )}
    </section>
  );
}
