import type { ExposureGroupDto, OutcomeDto } from '@ratewarden/shared/groups';
import { roleMay } from '@ratewarden/shared/permissions';
import { offeredWindows, type WindowKind } from '@ratewarden/shared/windows';
import type { RunDetail, RunResult } from '@ratewarden/shared/runs';
import type { SessionUser } from '@ratewarden/shared/session';
import { useQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { Cautions } from '../../components/cautions/cautions';
import { QueryState } from '../../components/feedback/query-state';
import { SelectField } from '../../components/form/select-field';
import { UnitsStrip } from '../../components/units/units-strip';
import { PrintButton } from '../../components/layout/print-button';
import { UnattributedNote } from '../../components/data-quality/unattributed-note';
import { paths } from '../../config/paths';
import { formatWhen } from '../../lib/dates';
import { COMPLEMENT_TEXT, smallCellThreshold } from '../../lib/small-cells';
import { flagsQueryOptions } from '../../api/get-flags';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useSites } from '../../api/get-sites';
import { useRunResults } from './api/get-run-results';
import { useRunPeriods } from './api/get-run-periods';
import { useCurrentRun } from '../../api/get-run';
import { useResultsFilters, type ResultsFilters } from './results-filters';
import { defaultPeriod, isPartialPeriod, latestCompletePeriod } from './default-period';
import { PartialPeriodNote, partialSuffix } from './partial-period';
import { unitsOf } from './results-units';
import { periodChoiceLabel, periodName, windowName } from './window-text';

export interface ResultsContext {
  user: SessionUser;
  run: RunDetail;
  outcome: OutcomeDto;
  groups: ExposureGroupDto[];
  groupName: (id: number) => string;
  /**
   * The results the page shows: with a period choice, the chosen window's rows of that period
   * only; without one (the trends page), every result of the chosen outcome.
   */
  results: RunResult[];
  filters: ResultsFilters;
  /** The chosen period, or the latest complete one the reader can see (default-period.ts). */
  period: string | null;
  setFilters: ReturnType<typeof useResultsFilters>[1];
}

/**
 * The frame of every results page: the outcome, window and period choices, the settings of the
 * live run beside the figures, loading and error states for the results, and the cautions.
 */
export function ResultsFrame({
  title,
  intro,
  user,
  fixedWindow,
  periodChoice = true,
  extraControls,
  children,
}: {
  title: string;
  intro: string;
  user: SessionUser;
  /** A page about one window only (the overview: rolling 12 months) hides the window choice. */
  fixedWindow?: WindowKind;
  /** The trends page shows every period, so it has no period choice. */
  periodChoice?: boolean;
  extraControls?: (ctx: { filters: ResultsFilters; setFilters: ResultsContext['setFilters']; groups: ExposureGroupDto[] }) => ReactNode;
  children: (ctx: ResultsContext) => ReactNode;
}) {
  const { data: run } = useCurrentRun();
  const { data: outcomes } = useOutcomes();
  const { data: groups } = useGroups();
  const { data: sites } = useSites();
  // Without a choice in the address, open on the outcome of the newest open flag: that is where a reader is needed.
  const flags = useQuery({ ...flagsQueryOptions({}), enabled: roleMay(user.role, 'flags:read') });
  const flagged = flags.data?.find((f) => f.state !== 'closed')?.outcomeId;
  // The server serves company-wide figures only to people who see every site; everyone else
  // reads one of their own sites at a time (site scoping).
  const seesAllSites = sites.length > 0 && sites.every((s) => user.siteIds.includes(s.id));
  const ownSites = sites.filter((s) => user.siteIds.includes(s.id));
  const [chosen, setFilters] = useResultsFilters({ outcomeId: flagged ?? outcomes[0]?.id ?? null, siteId: seesAllSites ? null : (ownSites[0]?.id ?? null) });
  const siteId = chosen.siteId !== null && ownSites.some((s) => s.id === chosen.siteId) ? chosen.siteId : seesAllSites ? null : (ownSites[0]?.id ?? null);
  // The windows of the run's settings version only (shared/src/windows.ts); one it did not compute falls back to the first offered.
  const offered = run ? offeredWindows(run.settings) : [];
  const window = fixedWindow ?? (offered.includes(chosen.window) ? chosen.window : offered.includes('rolling12') ? 'rolling12' : (offered[0] ?? chosen.window));
  const filters: ResultsFilters = { ...chosen, window, siteId };
  const outcome = outcomes.find((o) => o.id === filters.outcomeId) ?? outcomes[0];
  const scope = siteId === null ? {} : { siteId };
  // Each page asks for what it shows: first the window's periods (cheap), then that period's rows.
  const index = useRunPeriods(run?.id, { outcomeId: outcome?.id, window: filters.window, ...scope });
  const periods = index.data?.periods ?? [];
  const period = filters.period && periods.some((p) => p.period === filters.period) ? filters.period : defaultPeriod(periods);
  const results = useRunResults(
    run?.id ?? '',
    periodChoice
      ? { outcomeId: outcome?.id, window: filters.window, ...(period ? { from: period, to: period } : {}), ...scope }
      : // The trends page: every period of its window, and the months its control chart draws.
        { outcomeId: outcome?.id, windows: [...new Set(['month', filters.window] as const)].sort(), ...scope },
    !periodChoice || (index.isSuccess && period !== null),
  );
  const siteOptions = [...(seesAllSites ? [{ value: '', label: 'All sites together' }] : []), ...ownSites.map((s) => ({ value: String(s.id), label: s.name }))];
  const chosenSite = sites.find((s) => s.id === siteId);

  if (!run || !outcome) {
    return (
      <section>
        <h1 className="text-2xl font-bold tracking-tight">{title}</h1>
        <div role="status" className="mt-6 max-w-2xl note note-watch px-5 py-4">
          <p className="font-semibold">{!outcome ? 'No outcomes are set up yet.' : 'No run has finished yet, so there are no figures to show.'}</p>
          <p className="mt-1">
            {roleMay(user.role, 'runs:trigger') ? (
              <>
                Apply a roster and a case list, then start a run from the{' '}
                <Link className="text-accent underline" to={paths.runs}>
                  run history
                </Link>
                .
              </>
            ) : (
              'Figures appear here after the hygienist has applied the first roster and case list and a run has finished.'
            )}
          </p>
        </div>
      </section>
    );
  }

  const groupName = (id: number) => groups.find((g) => g.id === id)?.name ?? `group ${id}`;
  const windowOptions = offered.map((w) => ({ value: w, label: windowName(w, run.settings) }));
  return (
    <section>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <h1 className="text-2xl font-bold tracking-tight">{title}</h1>
        <PrintButton />
      </div>
      <p className="mt-2 max-w-3xl text-ink-soft">{intro}</p>
      <form aria-label="Choose what to show" className="no-print mt-5 flex flex-wrap items-end gap-4 card p-3" onSubmit={(e) => e.preventDefault()}>
        <SelectField
          label="Outcome"
          value={String(outcome.id)}
          onChange={(e) => setFilters({ outcomeId: e.target.value, period: null })}
          options={outcomes.map((o) => ({ value: String(o.id), label: o.name }))}
        />
        {siteOptions.length > 1 && (
          <SelectField
            label="Sites"
            value={siteId === null ? '' : String(siteId)}
            onChange={(e) => setFilters({ siteId: e.target.value, period: null })}
            options={siteOptions}
          />
        )}
        {!fixedWindow && (
          <SelectField label="Window" value={filters.window} onChange={(e) => setFilters({ window: e.target.value, period: null })} options={windowOptions} />
        )}
        {periodChoice && index.data && (
          <SelectField
            label={periodChoiceLabel[filters.window]}
            value={period ?? ''}
            onChange={(e) => setFilters({ period: e.target.value })}
            options={periods.map((p) => ({
              value: p.period,
              label: `${periodName(filters.window, p.period, run.settings)}${partialSuffix(p.completeness === 'partial')}`,
            }))}
          />
        )}
        {extraControls?.({ filters, setFilters, groups })}
      </form>
      <div className="mt-3">
        <UnitsStrip settings={unitsOf(run.settings, run.settingsVersion)} />
        <p className="mt-1 text-xs text-ink-soft">
          Run {run.number}, finished {formatWhen(run.finishedAt)} · cases counted: {run.settings.countedStatuses.join(', ')} ·{' '}
          {outcome.countingRule === 'first_event' ? 'first event only' : 'recurrent events'}
          {outcome.lagMonths ? ` · exposure lag ${outcome.lagMonths} months` : ''} ·{' '}
          {chosenSite ? `site: ${chosenSite.name} (its own figures)` : sitesTogether(sites.map((s) => s.name))}
        </p>
        <UnattributedNote run={run} outcomes={outcomes} role={user.role} outcomeId={outcome.id} />
      </div>
      {periodChoice && index.isError ? (
        <QueryState query={index} label="periods">
          {() => null}
        </QueryState>
      ) : periodChoice && index.isSuccess && period === null ? (
        <p role="status" className="mt-6 text-ink-soft">
          The current run has no figures of this outcome for this window{chosenSite ? ` at ${chosenSite.name}` : ''}.
        </p>
      ) : (
        <QueryState query={results} label="results">
          {(data) => {
            return (
              <>
                {periodChoice && isPartialPeriod(periods, period) && (
                  <PartialPeriodNote period={period!} window={filters.window} settings={run.settings} latestComplete={latestCompletePeriod(periods)} />
                )}
                {children({ user, run, outcome, groups, groupName, results: data, filters, period, setFilters })}
                <SuppressionNote results={data} />
              </>
            );
          }}
        </QueryState>
      )}
      <Cautions />
    </section>
  );
}

/** The sites behind company-wide figures: named when few, counted when many (the line stays one line). */
function sitesTogether(names: string[]): string {
  if (names.length === 0) return 'sites: none';
  return names.length <= 6 ? `sites: ${names.join(', ')} (all sites together)` : `all ${names.length} sites together`;
}

/** Says why counts are missing, when some are: small ones, the complements that protect them, and months read by year. */
function SuppressionNote({ results }: { results: RunResult[] }) {
  const small = results.some((r) => r.withheld === 'small');
  const complement = results.some((r) => r.withheld === 'complement');
  const months = results.some((r) => r.withheld === 'months');
  if (!small && !complement && !months) return null;
  return (
    <p className="mt-3 text-xs text-ink-soft">
      {small &&
        `Counts from 1 to ${smallCellThreshold() - 1} are shown as “<${smallCellThreshold()}”, with the figures computed from them, so that nobody can be picked out; only the occupational physician sees them. `}
      {complement &&
        `“${COMPLEMENT_TEXT}”: a count that is not small itself, kept back because with the other sites’ or strata’s figures it would give a small count back by subtraction. `}
      {months &&
        `Where a group has small monthly counts, its single months and most rolling windows are kept back too (two overlapping windows would give a month back by difference): it is shown by calendar year, in the rolling twelve-month windows that end in December and the calendar-year window; its calendar quarters and whole-period windows are kept back too (they differ by a month from one another), and the year in progress is the physician's.`}
    </p>
  );
}
