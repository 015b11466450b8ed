import { roleMay } from '@ratewarden/shared/permissions';
import type { SirRow } from '@ratewarden/shared/reference-rates';
import type { SessionUser } from '@ratewarden/shared/session';
import { createColumnHelper } from '@tanstack/react-table';
import { useSearchParams } from 'react-router';
import { Cautions } from '../../components/cautions/cautions';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { QueryState } from '../../components/feedback/query-state';
import { SelectField } from '../../components/form/select-field';
import { PrintButton } from '../../components/layout/print-button';
import { DataTable } from '../../components/table/data-table';
import { formatAmount, formatEstimate } from '../../lib/format';
import { formatWhen } from '../../lib/dates';
import { showCount, smallCellThreshold } from '../../lib/small-cells';
import { useCurrentRun } from '../../api/get-run';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useSites } from '../../api/get-sites';
import { useRunSir } from './api/get-run-sir';
import { ReferenceHistory } from './reference-history';
import { ReferenceUploadPanel } from './reference-upload-panel';

/** The healthy-worker effect, said where the SIR is read (DESIGN.md cautions). */
export const HEALTHY_WORKER_TEXT =
  'Healthy-worker effect: people in work are healthier than the general population the reference rates come from, so an SIR near or below 1 does not show that an exposure is harmless, and an SIR above 1 may understate the excess.';

const num = (x: number | 'Infinity' | null) => (x === 'Infinity' ? Infinity : x);

interface Row {
  group: string;
  r: SirRow;
}

function columns(role: SessionUser['role'], pct: number) {
  const col = createColumnHelper<Row>();
  const hidden = (r: SirRow) => r.withheld !== null;
  const interval = (r: SirRow, l: number | 'Infinity' | null, u: number | 'Infinity' | null) =>
    hidden(r) ? 'not shown' : `${formatEstimate(num(l))} to ${formatEstimate(num(u))}`;
  return [
    col.accessor('group', { header: 'Exposure group' }),
    col.accessor((x) => x.r.observed ?? -1, {
      id: 'observed',
      header: 'Observed (O)',
      cell: (c) => showCount(c.row.original.r.observed, role, smallCellThreshold(), c.row.original.r.withheld).text,
      meta: { numeric: true },
    }),
    col.accessor((x) => x.r.expected, { id: 'expected', header: 'Expected (E)', cell: (c) => formatAmount(c.getValue()), meta: { numeric: true } }),
    col.accessor((x) => x.r.sir ?? -Infinity, {
      id: 'sir',
      header: 'SIR (O/E)',
      cell: (c) => (hidden(c.row.original.r) ? 'not shown' : formatEstimate(c.row.original.r.sir)),
      meta: { numeric: true },
    }),
    col.accessor((x) => interval(x.r, x.r.exact.lower, x.r.exact.upper), {
      id: 'exact',
      header: `${pct}% exact interval`,
      enableSorting: false,
      meta: { numeric: true },
    }),
    col.accessor((x) => interval(x.r, x.r.byar.lower, x.r.byar.upper), {
      id: 'byar',
      header: `${pct}% Byar interval`,
      enableSorting: false,
      meta: { numeric: true },
    }),
    col.accessor((x) => x.r.excess ?? -Infinity, {
      id: 'excess',
      header: 'O − E',
      cell: (c) => (hidden(c.row.original.r) ? 'not shown' : formatEstimate(c.row.original.r.excess)),
      meta: { numeric: true },
    }),
    col.accessor((x) => x.r.personYears, { id: 'py', header: 'Person-years compared', cell: (c) => formatAmount(c.getValue()), meta: { numeric: true } }),
    col.accessor((x) => x.r.personYearsUncovered, {
      id: 'uncovered',
      header: 'Person-years without a reference rate',
      cell: (c) => formatAmount(c.getValue()),
      meta: { numeric: true },
    }),
  ];
}

/**
 * Standardized incidence ratios of the current run: each exposure group's observed cases against
 * those expected from the external reference rates for its person-time by sex × age band × year,
 * with exact and Byar intervals; the hygienist uploads the reference rates here too.
 */
export function SirPage({ user }: { user: SessionUser }) {
  const { data: run } = useCurrentRun();
  const { data: outcomes } = useOutcomes();
  const { data: groups } = useGroups();
  const { data: sites } = useSites();
  const [params, setParams] = useSearchParams();
  const seesAllSites = sites.length > 0 && sites.every((s) => user.siteIds.includes(s.id));
  const ownSites = sites.filter((s) => user.siteIds.includes(s.id));
  const asked = Number(params.get('outcomeId'));
  const outcome = outcomes.find((o) => o.id === asked) ?? outcomes[0];
  const askedSite = Number(params.get('siteId'));
  const siteId = ownSites.some((s) => s.id === askedSite) ? askedSite : seesAllSites ? undefined : ownSites[0]?.id;
  const sir = useRunSir(run?.id, { outcomeId: outcome?.id, ...(siteId !== undefined ? { siteId } : {}) });
  const set = (k: string, v: string) => {
    const next = new URLSearchParams(params);
    if (v) next.set(k, v);
    else next.delete(k);
    setParams(next, { replace: true });
  };
  const groupName = (id: number) => groups.find((g) => g.id === id)?.name ?? `group ${id}`;
  const pct = run ? Math.round(run.settings.confidence * 100) : 95;
  const siteOptions = [...(seesAllSites ? [{ value: '', label: 'All sites together' }] : []), ...ownSites.map((s) => ({ value: String(s.id), label: s.name }))];

  return (
    <section>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <h1 className="text-2xl font-bold tracking-tight">Against reference rates (SIR)</h1>
        <PrintButton />
      </div>
      <p className="mt-2 max-w-3xl text-ink-soft">
        The standardized incidence ratio compares each exposure group with an outside population: the cases observed (O) against those expected (E) if the group
        had the reference rates, for its own person-time by sex, age band and calendar year. An SIR of 1 means as many cases as expected.
      </p>
      <p role="note" className="mt-3 max-w-3xl note note-watch px-4 py-3 text-sm">
        {HEALTHY_WORKER_TEXT}
      </p>
      {outcome && run ? (
        <>
          <form aria-label="Choose what to show" className="no-print mt-5 flex flex-wrap items-end gap-4 card p-3" onSubmit={(e) => e.preventDefault()}>
            <SelectField
              label="Outcome"
              value={String(outcome.id)}
              onChange={(e) => set('outcomeId', e.target.value)}
              options={outcomes.map((o) => ({ value: String(o.id), label: o.name }))}
            />
            {siteOptions.length > 1 && (
              <SelectField
                label="Sites"
                value={siteId === undefined ? '' : String(siteId)}
                onChange={(e) => set('siteId', e.target.value)}
                options={siteOptions}
              />
            )}
          </form>
          <QueryState query={sir} label="SIRs">
            {(data) => {
              const rows: Row[] = data.rows.map((r) => ({ group: groupName(r.exposureGroupId), r }));
              const items = rows.map((x) => ({ label: x.group, estimate: x.r.sir, lower: num(x.r.exact.lower), upper: num(x.r.exact.upper) }));
              return (
                <>
                  <p className="mt-3 text-xs text-ink-soft">
                    Run {data.runNumber}, finished {formatWhen(run.finishedAt)} · {pct}% intervals · reference rates{' '}
                    {data.referenceVersion === null ? 'none' : `version ${data.referenceVersion}`}
                    {data.sources.length ? ` (${data.sources.join('; ')})` : ''}
                  </p>
                  {rows.length === 0 ? (
                    <p role="status" className="mt-4 note note-watch px-4 py-3">
                      {data.referenceVersion === null
                        ? 'The current run had no reference rates. Once the hygienist uploads them, the next run computes the SIRs.'
                        : `The reference rates hold no rates for ${outcome.name}, or no person-time falls in their years, age bands and sexes.`}
                    </p>
                  ) : (
                    <>
                      <IntervalPlot
                        title={`${outcome.name}: SIR against the reference rates with ${pct}% exact intervals`}
                        items={items}
                        valueLabel="SIR (log scale)"
                        csv={{
                          name: `sir-${outcome.code}`,
                          header: ['Exposure group', 'SIR', 'Lower limit', 'Upper limit'],
                          rows: items.map((i) => [i.label, i.estimate, i.lower, i.upper]),
                        }}
                      />
                      <DataTable
                        caption={`SIR by exposure group (${pct}% intervals)`}
                        columns={columns(user.role, pct)}
                        data={rows}
                        exportName={`sir-${outcome.code}`}
                        rowHeader="group"
                      />
                      <p className="mt-2 text-xs text-ink-soft">
                        Intervals: {data.rows[0]?.methods.exact}; {data.rows[0]?.methods.byar}. A group whose observed count is withheld shows no SIR, no O − E
                        and no interval: each would give the count back.
                      </p>
                    </>
                  )}
                </>
              );
            }}
          </QueryState>
        </>
      ) : (
        <p role="status" className="mt-6 note note-watch px-4 py-3">
          {!outcome ? 'No outcomes are set up yet.' : 'No run has finished yet, so there are no SIRs to show.'}
        </p>
      )}
      {roleMay(user.role, 'reference:write') && <ReferenceUploadPanel />}
      <ReferenceHistory />
      <Cautions
        extra={[
          'The SIR compares with an outside population: differences in case definitions, diagnosis and reporting between the workplace and the reference source bias it too.',
        ]}
      />
    </section>
  );
}
