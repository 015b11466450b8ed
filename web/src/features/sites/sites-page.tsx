import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { StateTag } from '../../components/status/state-tag';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { useSites } from '../../api/get-sites';
import { useSetSiteRetired } from './api/save-site';
import { SiteForm } from './site-form';

/** The administrator's sites: create, rename, retire (a retired site keeps its history) or reinstate. */
export function SitesPage() {
  const { data: sites } = useSites();
  const retire = useSetSiteRetired();
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Sites</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        The workplaces rosters and case lists belong to. A retired site keeps its rosters, cases, results and flags, and is no longer expected to report the
        months after the one it was retired in. Give people access to a site under Administration.
      </p>
      {retire.isError && <ProblemNotice title="Not changed" problem={problemOf(retire.error).problem} />}
      <ResultTable
        caption={`Sites (${sites.length})`}
        columns={['Site', 'Code', 'Region', 'State', 'Change']}
        exportName="sites"
        rows={sites.map((s) => ({
          key: String(s.id),
          cells: [
            <>
              <span className="font-medium">{s.name}</span>
              {editing === s.id && <SiteForm site={s} onDone={() => setEditing(null)} />}
            </>,
            <code className="font-mono">{s.code}</code>,
            s.region ?? '—',
            s.retiredAt ? <StateTag text={`retired ${formatWhen(s.retiredAt)}`} tone="neutral" /> : <StateTag text="active" tone="good" />,
            <span className="flex flex-wrap gap-3">
              <button type="button" className="text-accent underline" onClick={() => setEditing(s.id)}>
                Rename<span className="sr-only"> {s.name}</span>
              </button>
              <button
                type="button"
                disabled={retire.isPending}
                className="text-accent underline"
                onClick={() => retire.mutate({ id: s.id, retired: s.retiredAt === null })}
              >
                {s.retiredAt === null ? 'Retire' : 'Reinstate'}
                <span className="sr-only"> {s.name}</span>
              </button>
            </span>,
          ],
          csv: [s.name, s.code, s.region, s.retiredAt ?? 'active', ''],
        }))}
      />
      {editing === 'new' ? (
        <SiteForm site={null} onDone={() => setEditing(null)} />
      ) : (
        <button type="button" className="btn btn-primary mt-4 px-4 py-2" onClick={() => setEditing('new')}>
          New site
        </button>
      )}
    </section>
  );
}
