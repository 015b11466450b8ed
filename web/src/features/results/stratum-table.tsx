import type { RunStratum } from '@ratewarden/shared/runs';
import { QueryState } from '../../components/feedback/query-state';
import { SelectField } from '../../components/form/select-field';
import { ResultTable } from '../../components/table/result-table';
import { formatAmount, formatEstimate } from '../../lib/format';
import { toNumber } from '../../lib/json-number';
import { exportCount, showCount } from '../../lib/small-cells';
import { useRunStrata } from './api/get-run-strata';
import type { ResultsContext } from './results-frame';
import { personTimeUnit, rateUnit } from './results-units';

const ci = (i: RunStratum['irr'], hidden: boolean) =>
  hidden ? 'not shown' : i ? `${formatEstimate(toNumber(i.estimate))} (${formatEstimate(toNumber(i.lower))} to ${formatEstimate(toNumber(i.upper))})` : '—';
/** A withheld count takes its rate with it. */
const rateText = (arm: RunStratum['exposed'] | null) => (!arm ? '—' : arm.withheld ? 'not shown' : formatEstimate(toNumber(arm.rate)));

/**
 * The stratum table behind the adjusted figures: for one exposure group and its reference group,
 * each stratum's cases, person-time and rate, and its own IRR and IRD, read from the cells the run
 * aggregated. Counts the reader may not see come withheld from the server (small, or their complements).
 */
export function StratumTable({ ctx, comparedIds, label }: { ctx: ResultsContext; comparedIds: number[]; label: string }) {
  const { run, outcome, filters, period, groupName, setFilters, user } = ctx;
  const groupId = filters.groupId !== null && comparedIds.includes(filters.groupId) ? filters.groupId : (comparedIds[0] ?? null);
  const oneSiteBySite = filters.stratify === 'site' && filters.siteId !== null;
  const query =
    groupId === null || period === null || oneSiteBySite
      ? null
      : {
          outcomeId: outcome.id,
          exposureGroupId: groupId,
          window: filters.window,
          period,
          by: filters.stratify,
          ...(filters.siteId === null ? {} : { siteId: filters.siteId }),
        };
  const strata = useRunStrata(run.id, query);
  const pct = Math.round(run.settings.confidence * 100);
  const unit = rateUnit(run.settings);
  const pt = personTimeUnit(run.settings);

  return (
    <>
      <h2 className="mt-8 text-xl font-semibold">Stratum by stratum</h2>
      {comparedIds.length === 0 ? (
        <p className="mt-2">No group is compared with a reference group in this period.</p>
      ) : oneSiteBySite ? (
        <p className="mt-2">One site is a single site stratum; choose all sites together, or stratify by age band or sex.</p>
      ) : (
        <>
          <form
            className="no-print mt-2 flex flex-wrap items-end gap-4"
            onSubmit={(e) => e.preventDefault()}
            aria-label="Choose the group of the stratum table"
          >
            <SelectField
              label="Group"
              value={String(groupId)}
              onChange={(e) => setFilters({ groupId: e.target.value })}
              options={comparedIds.map((id) => ({ value: String(id), label: groupName(id) }))}
            />
          </form>
          <QueryState query={strata} label="strata">
            {(data) => {
              const ref = data.referenceGroupId === null ? 'reference' : groupName(data.referenceGroupId);
              const me = groupName(data.exposureGroupId);
              return (
                <>
                  <ResultTable
                    caption={`${me} against ${ref}, by ${label} (${pct}% intervals; rates and IRD ${unit})`}
                    columns={[
                      label[0]!.toUpperCase() + label.slice(1),
                      `${me}: cases`,
                      `${me}: person-time (${pt})`,
                      `${me}: rate`,
                      `${ref}: cases`,
                      `${ref}: person-time (${pt})`,
                      `${ref}: rate`,
                      'IRR (interval)',
                      'IRD (interval)',
                    ]}
                    exportName={`strata-${outcome.code}-${filters.stratify}-${period}`}
                    rows={data.strata.map((s) => {
                      const a = showCount(s.exposed.cases, user.role, undefined, s.exposed.withheld);
                      const b = s.reference ? showCount(s.reference.cases, user.role, undefined, s.reference.withheld) : null;
                      const hidden = a.suppressed || (b?.suppressed ?? false);
                      return {
                        key: s.key ?? 'unknown',
                        cells: [
                          s.label,
                          a.text,
                          formatAmount(s.exposed.personTime),
                          rateText(s.exposed),
                          b?.text ?? '—',
                          s.reference ? formatAmount(s.reference.personTime) : '—',
                          rateText(s.reference),
                          ci(s.irr, hidden),
                          ci(s.ird, hidden),
                        ],
                        csv: [
                          s.label,
                          exportCount(s.exposed.cases, user.role, undefined, s.exposed.withheld),
                          s.exposed.personTime,
                          toNumber(s.exposed.rate),
                          s.reference ? exportCount(s.reference.cases, user.role, undefined, s.reference.withheld) : null,
                          s.reference?.personTime ?? null,
                          toNumber(s.reference?.rate ?? null),
                          toNumber(s.irr?.estimate ?? null),
                          toNumber(s.ird?.estimate ?? null),
                        ],
                      };
                    })}
                  />
                  <p className="mt-2 text-xs text-ink-soft">
                    Each stratum's IRR: {data.methods.irr}; IRD: {data.methods.ird}. A stratum with few cases gives a wide interval; the adjusted figure above
                    pools them.
                  </p>
                </>
              );
            }}
          </QueryState>
        </>
      )}
    </>
  );
}
