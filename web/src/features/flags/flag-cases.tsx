import type { FlagCase } from '@ratewarden/shared/flags';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import { paths } from '../../config/paths';
import { QueryState } from '../../components/feedback/query-state';
import { DataTable } from '../../components/table/data-table';
import { useSites } from '../../api/get-sites';
import { useFlagCases } from './api/get-flag-cases';

const col = createColumnHelper<FlagCase & { site: string }>();
const columns = [
  col.accessor('caseRef', {
    header: 'Case',
    cell: (c) => (
      <Link to={paths.case(c.getValue())} className="text-accent underline">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('workerKey', { header: 'Worker (pseudonym)' }),
  col.accessor('onsetDate', { header: 'Onset' }),
  col.accessor('status', { header: 'Status' }),
  col.accessor('site', { header: 'Site' }),
];

/** The physician's view of the cases counted in a flag (the server refuses every other role). */
export function FlagCases({ flagId }: { flagId: string }) {
  const cases = useFlagCases(flagId, true);
  const { data: sites } = useSites();
  return (
    <section aria-labelledby="cases-heading" className="mt-8 note note-alarm p-4">
      <h2 id="cases-heading" className="text-xl font-semibold">
        Cases behind this flag
      </h2>
      <p className="mt-1 text-sm text-ink-soft">
        Confidential medical information, shown to the occupational physician only; every opening of this list is recorded.
      </p>
      <QueryState query={cases} label="cases">
        {(data) => (
          <DataTable
            caption={`Cases counted (${data.length})`}
            columns={columns}
            data={data.map((c) => ({ ...c, site: sites.find((s) => s.id === c.siteId)?.name ?? String(c.siteId) }))}
            exportName={`flag-${flagId}-cases`}
            rowHeader="caseRef"
          />
        )}
      </QueryState>
    </section>
  );
}
