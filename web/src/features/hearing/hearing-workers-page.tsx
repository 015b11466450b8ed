import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import type { HearingWorkerSummary } from '@ratewarden/shared/hearing/hearing-view';
import { Cautions } from '../../components/cautions/cautions';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { useHearingWorkers } from './api/get-hearing-workers';
import { hearingCautions } from './hearing-cautions';

const col = createColumnHelper<HearingWorkerSummary>();
const columns = [
  col.accessor('workerKey', {
    header: 'Worker (pseudonym)',
    cell: (c) => (
      <Link to={paths.hearingWorker(c.getValue())} className="text-accent underline">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('tests', { header: 'Tests' }),
  col.accessor('lastTestDate', { header: 'Last test' }),
  col.accessor('shifts', { header: 'Standard threshold shifts' }),
];

/** The physician's list of workers with audiograms, each opening that worker's page. */
export function HearingWorkersPage() {
  const { data } = useHearingWorkers();
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Audiograms</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Workers with audiograms, and how many standard threshold shifts their tests show against the baseline in use (29 CFR 1910.95(g)(10)). Each shift became
        a suspected case of the hearing outcome for your review.
      </p>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        Confidential medical information, shown to the occupational physician only; every opening of this list is recorded.
      </p>
      <DataTable
        caption={`Workers with audiograms (${data.workers.length})`}
        columns={columns}
        data={data.workers}
        exportName="audiogram-workers"
        rowHeader="workerKey"
      />
      <Cautions extra={hearingCautions} />
    </section>
  );
}
