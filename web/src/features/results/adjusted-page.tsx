import type { SessionUser } from '@ratewarden/shared/session';
import { METHODS } from '@ratewarden/shared/stats/methods';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { SelectField } from '../../components/form/select-field';
import { ResultTable } from '../../components/table/result-table';
import { formatAmount, formatEstimate, formatP } from '../../lib/format';
import { toNumber } from '../../lib/json-number';
import { exportCount, showCount } from '../../lib/small-cells';
import { ResultsFrame, type ResultsContext } from './results-frame';
import { personTimeUnit, rateUnit } from './results-units';
import { shownResult } from './shown-result';
import { StratumTable } from './stratum-table';
import { partialSuffix } from './partial-period';
import { windowPeriodText } from './window-text';
import { levelRows, trendOf } from './trend-levels';
import { trendReading } from './trend-reading';

interface ChiSquare {
  chi2: number | null;
  df: number | null;
  p: number | null;
}

const stratifications = {
  age: { label: 'age band', key: 'mhAge', homogeneity: 'mhAgeHomogeneity', strata: 'mhAgeStrataUsed' },
  site: { label: 'site', key: 'mhSite', homogeneity: 'mhSiteHomogeneity', strata: 'mhSiteStrataUsed' },
  sex: { label: 'sex', key: 'mhSex', homogeneity: 'mhSexHomogeneity', strata: 'mhSexStrataUsed' },
} as const;

const ci = (e: number | null, l: number | null, u: number | null) => `${formatEstimate(e)} (${formatEstimate(l)} to ${formatEstimate(u)})`;

function AdjustedBody({ ctx }: { ctx: ResultsContext }) {
  const { results, filters, period, groupName, outcome, run, groups, user } = ctx;
  const st = stratifications[filters.stratify];
  const pct = Math.round(run.settings.confidence * 100);
  const unit = rateUnit(run.settings);
  const cells = results.filter((r) => r.window === filters.window && r.period === period);
  const compared = cells.filter((r) => !r.isReference);
  const partial = cells.some((r) => r.completeness === 'partial');
  const completeness = partial ? 'partial' : 'complete';
  const when = `${period ? windowPeriodText(filters.window, period, run.settings) : '—'}${partialSuffix(partial)}`;

  const rows = compared.map((r) => {
    const s = shownResult(r, user.role);
    const mh = r[st.key];
    const h = s.comparisonHidden;
    const v = (x: number | string | null) => (h ? null : toNumber(x));
    const hom = (r.detail[st.homogeneity] as ChiSquare | undefined) ?? { chi2: null, df: null, p: null };
    const used = (r.detail[st.strata] as { irr: number; ird: number } | undefined) ?? null;
    return {
      name: groupName(r.exposureGroupId),
      hidden: h,
      ownHidden: s.hidden,
      crude: { irr: s.irr, lo: s.irrLower, hi: s.irrUpper, ird: s.ird, irdLo: s.irdLower, irdHi: s.irdUpper },
      mh: {
        irr: v(mh.irr.estimate),
        lo: v(mh.irr.lower),
        hi: v(mh.irr.upper),
        p: h ? null : mh.irr.p,
        ird: v(mh.ird.estimate),
        irdLo: v(mh.ird.lower),
        irdHi: v(mh.ird.upper),
      },
      hom: h ? { chi2: null, df: null, p: null } : hom,
      used,
    };
  });

  const items = rows.flatMap((r) => [
    { label: `${r.name}: crude`, estimate: r.crude.irr, lower: r.crude.lo, upper: r.crude.hi },
    { label: `${r.name}: adjusted for ${st.label}`, estimate: r.mh.irr, lower: r.mh.lo, upper: r.mh.hi },
  ]);
  const levels = levelRows(cells, groups);
  const trend = trendOf(levels, { confidence: run.settings.confidence, per: run.settings.per });

  return (
    <>
      <p className="mt-4 text-sm">
        Crude figures compare each group with the reference group as a whole; adjusted figures pool the comparisons within each {st.label} (Mantel–Haenszel),{' '}
        {when}.
      </p>
      <IntervalPlot
        title={`${outcome.name}: crude and ${st.label}-adjusted IRR with ${pct}% intervals`}
        items={items}
        csv={{
          name: `adjusted-irr-${outcome.code}-${filters.stratify}-${period}`,
          header: ['Comparison', 'IRR', 'Lower limit', 'Upper limit', 'Period'],
          rows: items.map((i) => [i.label, i.estimate, i.lower, i.upper, completeness]),
        }}
      />
      <ResultTable
        caption={`Crude and Mantel–Haenszel adjusted comparisons, stratified by ${st.label} (${pct}% intervals, IRD ${unit})`}
        columns={[
          'Exposure group',
          'Crude IRR',
          `Adjusted IRR (${st.label})`,
          'p (MH, IRR = 1)',
          'Crude IRD',
          `Adjusted IRD (${st.label})`,
          'Homogeneity χ² (df)',
          'Homogeneity p',
          'Strata used',
          'Period',
        ]}
        exportName={`adjusted-${outcome.code}-${filters.stratify}-${period}`}
        rows={rows.map((r) => ({
          key: r.name,
          cells: r.hidden
            ? [
                r.name,
                r.ownHidden ? 'not shown (small count)' : "not shown (the reference group's count is small)",
                '—',
                '—',
                '—',
                '—',
                '—',
                '—',
                '—',
                completeness,
              ]
            : [
                r.name,
                ci(r.crude.irr, r.crude.lo, r.crude.hi),
                ci(r.mh.irr, r.mh.lo, r.mh.hi),
                formatP(r.mh.p),
                ci(r.crude.ird, r.crude.irdLo, r.crude.irdHi),
                ci(r.mh.ird, r.mh.irdLo, r.mh.irdHi),
                `${formatEstimate(r.hom.chi2)} (${r.hom.df ?? '—'})`,
                formatP(r.hom.p),
                r.used ? String(r.used.irr) : '—',
                completeness,
              ],
          csv: [r.name, r.crude.irr, r.mh.irr, r.mh.p, r.crude.ird, r.mh.ird, r.hom.chi2, r.hom.p, r.used?.irr ?? null, completeness],
        }))}
      />
      <p className="mt-2 text-xs text-ink-soft">
        Methods: {METHODS.mhIrr}; {METHODS.mhRateTest}; {METHODS.mhIrd}; homogeneity: {METHODS.rateHomogeneity}. A small homogeneity p says the ratio differs
        between strata, and one pooled figure hides that.
      </p>
      <StratumTable ctx={ctx} comparedIds={compared.map((r) => r.exposureGroupId)} label={st.label} />

      <h2 className="mt-8 text-xl font-semibold">Trend across exposure levels</h2>
      {trend ? (
        <>
          <p className="mt-2" role="status">
            Score test for trend: χ² = <strong>{formatEstimate(trend.chi2)}</strong> (1 df), p = <strong>{formatP(trend.p)}</strong>.{' '}
            {trendReading({
              u: trend.u,
              p: trend.p,
              alpha: 1 - run.settings.confidence,
              levels: levels.map((l, i) => ({ label: `level ${l.level}`, rate: trend.levels[i]?.rate.estimate ?? null })),
            })}
          </p>
          <ResultTable
            caption={`Cases, person-time and rate by ordinal exposure level, ${when}`}
            columns={['Exposure level', 'Groups', 'Cases', `Person-time (${personTimeUnit(run.settings)})`, `Rate ${unit}`, 'Period']}
            exportName={`trend-levels-${outcome.code}-${period}`}
            rows={levels.map((l, i) => {
              const c = showCount(l.cases, user.role);
              const rate = c.suppressed ? null : (trend.levels[i]?.rate.estimate ?? null);
              return {
                key: String(l.level),
                cells: [
                  String(l.level),
                  l.groups.join(', '),
                  c.text,
                  formatAmount(l.personTime),
                  c.suppressed ? 'not shown' : formatEstimate(rate),
                  completeness,
                ],
                csv: [l.level, l.groups.join('; '), exportCount(l.cases, user.role), l.personTime, rate, completeness],
              };
            })}
          />
          <p className="mt-2 text-xs text-ink-soft">Method: {METHODS.trend}, computed in the browser by the shared statistics core from the run's figures.</p>
        </>
      ) : (
        <p className="mt-2">
          {levels.some((l) => l.withheld)
            ? 'The trend test is not shown: a count at one of the levels is below the small-cell threshold, and a test on the rest would be wrong.'
            : 'Fewer than two exposure levels have data in this period; the hygienist sets the levels on the exposure groups page.'}
        </p>
      )}
    </>
  );
}

export function AdjustedPage({ user }: { user: SessionUser }) {
  return (
    <ResultsFrame
      title="Adjusted view"
      intro="Crude against Mantel–Haenszel adjusted rate ratios and differences for a chosen stratification, with the test of homogeneity across strata and the trend test across ordered exposure levels."
      user={user}
      extraControls={({ filters, setFilters }) => (
        <SelectField
          label="Stratify by"
          value={filters.stratify}
          onChange={(e) => setFilters({ stratify: e.target.value })}
          options={[
            { value: 'age', label: 'Age band' },
            { value: 'site', label: 'Site' },
            { value: 'sex', label: 'Sex' },
          ]}
        />
      )}
    >
      {(ctx) => <AdjustedBody ctx={ctx} />}
    </ResultsFrame>
  );
}
