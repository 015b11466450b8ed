import type { RunResult } from '@ratewarden/shared/runs';
import type { SessionUser } from '@ratewarden/shared/session';
import { TrendChart, type TrendSeries } from '../../components/charts/trend-chart';
import { SelectField } from '../../components/form/select-field';
import { exportCount } from '../../lib/small-cells';
import { ResultsFrame, type ResultsContext } from './results-frame';
import { personTimeUnit, rateUnit } from './results-units';
import { shownResult } from './shown-result';
import { PARTIAL_SHAPE } from './partial-period';
import { trendPhrase } from './window-text';

const month = (p: string) => p.slice(0, 7);

function seriesOf(results: RunResult[], periods: string[], name: string, ctx: ResultsContext): TrendSeries {
  const inRange = new Set(periods);
  return {
    name,
    points: results
      .filter((r) => inRange.has(r.period))
      .map((r) => {
        const s = shownResult(r, ctx.user.role);
        return {
          period: month(r.period),
          rate: s.rate,
          lower: s.rateLower,
          upper: s.rateUpper,
          cases: s.cases.text,
          personTime: r.personTime,
          partial: r.completeness === 'partial',
          withheld: s.hidden,
        };
      }),
  };
}

function csvOf(name: string, ctx: ResultsContext, rows: RunResult[], withLimits: boolean) {
  const header = [
    'Exposure group',
    'Period',
    'Window',
    'Cases',
    `Person-time (${personTimeUnit(ctx.run.settings)})`,
    `Rate ${rateUnit(ctx.run.settings)}`,
    'Lower limit',
    'Upper limit',
    ...(withLimits ? ['u-chart centre', 'Upper control limit', 'Lower control limit', 'Signal'] : []),
    'Completeness',
  ];
  return {
    name,
    header,
    rows: rows.map((r) => {
      const s = shownResult(r, ctx.user.role);
      const per = ctx.run.settings.per;
      const x = (v: number | null) => (v === null ? null : v * per);
      return [
        ctx.groupName(r.exposureGroupId),
        month(r.period),
        r.window,
        exportCount(r.cases, ctx.user.role, undefined, r.withheld ?? r.suppressed),
        r.personTime,
        s.rate,
        s.rateLower,
        s.rateUpper,
        ...(withLimits ? [x(r.uChart.centre), s.hidden ? null : x(r.uChart.ucl), s.hidden ? null : x(r.uChart.lcl), s.hidden ? null : r.uChart.signal] : []),
        r.completeness,
      ];
    }),
  };
}

function TrendsBody({ ctx }: { ctx: ResultsContext }) {
  const { results, filters, groups, outcome } = ctx;
  const unit = rateUnit(ctx.run.settings);
  const all = [...new Set(results.filter((r) => r.window === filters.window).map((r) => r.period))].sort();
  const periods = filters.span > 0 ? all.slice(-filters.span) : all;
  const inRange = new Set(periods);
  const groupIds = [...new Set(results.map((r) => r.exposureGroupId))];
  const windowRows = results.filter((r) => r.window === filters.window && inRange.has(r.period));
  const series = groupIds.map((g) =>
    seriesOf(
      windowRows.filter((r) => r.exposureGroupId === g),
      periods,
      ctx.groupName(g),
      ctx,
    ),
  );
  const windowLabel = trendPhrase[filters.window];

  const monthsAll = [...new Set(results.filter((r) => r.window === 'month').map((r) => r.period))].sort();
  const months = filters.span > 0 ? monthsAll.slice(-filters.span) : monthsAll;
  // Without a choice, the control chart opens on the compared group with the most cases in the months shown.
  const casesOf = (g: number) =>
    results.filter((r) => r.window === 'month' && r.exposureGroupId === g && months.includes(r.period)).reduce((n, r) => n + (r.cases ?? 0), 0);
  const compared = groupIds.filter((g) => !groups.find((x) => x.id === g)?.isReference);
  const busiest = [...compared].sort((a, b) => casesOf(b) - casesOf(a))[0];
  const chartGroup = groupIds.includes(filters.groupId ?? -1) ? filters.groupId! : (busiest ?? groupIds[0]);
  const monthRows = results.filter((r) => r.window === 'month' && r.exposureGroupId === chartGroup && months.includes(r.period));
  const byMonth = new Map(monthRows.map((r) => [r.period, r]));
  const hiddenMonth = (p: string) => {
    const r = byMonth.get(p);
    return !r || shownResult(r, ctx.user.role).hidden;
  };
  // The u-chart works in cases per unit of person-time; the chart shows rates times the run's multiplier.
  const per = ctx.run.settings.per;
  const scaled = (x: number | null | undefined) => (x === null || x === undefined ? null : x * per);
  const centre = monthRows.find((r) => r.uChart.centre !== null)?.uChart.centre;
  const limits = {
    centre: scaled(centre),
    ucl: months.map((p) => (hiddenMonth(p) ? null : scaled(byMonth.get(p)?.uChart.ucl))),
    lcl: months.map((p) => (hiddenMonth(p) ? null : scaled(byMonth.get(p)?.uChart.lcl))),
  };
  const partialMonths = [...new Set(windowRows.filter((r) => r.completeness === 'partial').map((r) => month(r.period)))];
  const above = monthRows.filter((r) => r.uChart.signal === 'above' && !shownResult(r, ctx.user.role).hidden).map((r) => month(r.period));

  return (
    <>
      <TrendChart
        title={`${outcome.name}: rate ${windowLabel} by exposure group, with ${Math.round(ctx.run.settings.confidence * 100)}% intervals`}
        periods={periods.map(month)}
        series={series}
        unit={unit}
        csv={csvOf(`trend-${outcome.code}-${filters.window}`, ctx, windowRows, false)}
      />
      <h2 className="mt-8 text-xl font-semibold">Control chart of one group</h2>
      <p className="mt-1 max-w-3xl text-sm text-ink-soft">
        Monthly rate of the group against its own average (u-chart: centre line, and 3-sigma limits that widen in months with less person-time).
      </p>
      <div className="no-print mt-2 max-w-xs">
        <SelectField
          label="Group on the control chart"
          value={String(chartGroup ?? '')}
          onChange={(e) => ctx.setFilters({ groupId: e.target.value })}
          options={groupIds.map((g) => ({ value: String(g), label: ctx.groupName(g) }))}
        />
      </div>
      {chartGroup !== undefined && (
        <TrendChart
          title={`${ctx.groupName(chartGroup)}: monthly rate with u-chart limits`}
          periods={months.map(month)}
          series={[seriesOf(monthRows, months, ctx.groupName(chartGroup), ctx)]}
          limits={limits}
          unit={unit}
          csv={csvOf(`control-chart-${outcome.code}-${chartGroup}`, ctx, monthRows, true)}
        />
      )}
      <p className="mt-2 text-sm" role="status">
        {partialMonths.length > 0 && (
          <>
            <span aria-hidden="true">{PARTIAL_SHAPE} </span>Hollow markers are partial periods (a roster or case list of some site was not in when the run read
            the data): {partialMonths.join(', ')}.{' '}
          </>
        )}
        {above.length ? `Months above the upper limit: ${above.join(', ')}.` : 'No month is above the upper limit in the period shown.'}
      </p>
    </>
  );
}

export function TrendsPage({ user }: { user: SessionUser }) {
  return (
    <ResultsFrame
      title="Trends"
      intro="Rates in the chosen window (per month, over rolling 12 months, or the other windows the analysis settings offer) for each exposure group, with their intervals; hover a point for its cases, person-time and interval."
      user={user}
      periodChoice={false}
      extraControls={({ filters, setFilters }) => (
        <SelectField
          label="Months shown"
          value={String(filters.span)}
          onChange={(e) => setFilters({ span: e.target.value })}
          options={[
            { value: '24', label: 'Last 24' },
            { value: '36', label: 'Last 36' },
            { value: '60', label: 'Last 60' },
            { value: '0', label: 'All' },
          ]}
        />
      )}
    >
      {(ctx) => <TrendsBody ctx={ctx} />}
    </ResultsFrame>
  );
}
