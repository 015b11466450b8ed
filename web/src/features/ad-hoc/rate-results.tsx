import type { RateComparisonResult } from '@ratewarden/shared/stats';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { ResultTable, type ResultRow } from '../../components/table/result-table';
import { formatAmount, formatCount, formatEstimate, formatP, formatPercent } from '../../lib/format';
import type { RateInput } from './ad-hoc-schemas';
import { perUnit, type AdHocSettings } from './ad-hoc-settings';
import { ReasonsList } from './reasons-list';
import { rateReading } from './reading';

type Limits = { lower: number | null; upper: number | null };

function row(key: string, name: string, estimate: number | null, limits: Limits | null, method: string, asPercent = false): ResultRow {
  const f = asPercent ? formatPercent : formatEstimate;
  return {
    key,
    cells: [name, f(estimate), limits ? f(limits.lower) : '—', limits ? f(limits.upper) : '—', method],
    csv: [name, estimate, limits?.lower ?? null, limits?.upper ?? null, method],
  };
}

export function RateResults({ input, result: r, settings }: { input: RateInput; result: RateComparisonResult; settings: AdHocSettings }) {
  const unit = perUnit(settings);
  const ptName = settings.basis === 'hours' ? 'Hours worked' : 'Person-years';
  const groups: [string, RateInput['exposed'], RateComparisonResult['rateExposed']][] = [
    ['Exposed', input.exposed, r.rateExposed],
    ['Reference', input.reference, r.rateReference],
  ];
  const rateRows: ResultRow[] = groups.map(([name, g, rate]) => ({
    key: name,
    cells: [name, formatCount(g.cases), formatAmount(g.personTime), formatEstimate(rate.estimate), `${formatEstimate(rate.exact.lower)} to ${formatEstimate(rate.exact.upper)}`, `${formatEstimate(rate.midP.lower)} to ${formatEstimate(rate.midP.upper)}`, `${formatEstimate(rate.byar.lower)} to ${formatEstimate(rate.byar.upper)}`],
    csv: [name, g.cases, g.personTime, rate.estimate, rate.exact.lower, rate.exact.upper, rate.midP.lower, rate.midP.upper, rate.byar.lower, rate.byar.upper],
  }));
  const measureRows: ResultRow[] = [
    row('irr-exact', 'Incidence rate ratio', r.irr.estimate, r.irr.exact, r.irr.methods.exact),
    row('irr-midp', 'Incidence rate ratio', r.irr.estimate, r.irr.midP, r.irr.methods.midP),
    row('irr-wald', 'Incidence rate ratio', r.irr.estimate, r.irr.wald, r.irr.methods.wald),
    row('ird', `Rate difference ${unit}`, r.ird.estimate, r.ird.wald, r.ird.methods.wald),
    row('af-exposed', 'Attributable fraction among the exposed', r.afExposed.estimate, r.afExposed, r.methods.afExposed, true),
    row('af-population', 'Attributable fraction in the population', r.afPopulation, null, r.methods.afPopulation, true),
    row('excess', 'Excess cases in the exposed group', r.excessCases, null, 'observed − expected at the reference rate'),
  ];
  const tests: [string, string, number | null, string][] = [
    ['p-exact', 'Rate ratio = 1', r.irr.pExact, r.irr.methods.pExact],
    ['p-exact-ml', 'Rate ratio = 1', r.irr.pExactMinLikelihood, r.irr.methods.pExactMinLikelihood],
    ['p-midp', 'Rate ratio = 1', r.irr.pMidP, r.irr.methods.pMidP],
    ['p-score', 'Rate ratio = 1', r.irr.pScore, r.irr.methods.pScore],
    ['p-wald', 'Rate ratio = 1', r.irr.pWald, r.irr.methods.pWald],
    ['p-ird', 'Rate difference = 0', r.ird.p, `${r.ird.methods.wald} z`],
  ];
  const conf = `${Number((r.confidence * 100).toFixed(2))}%`;
  return (
    <div>
      <section aria-labelledby="reading-heading" className="border-l-4 border-moss bg-moss-soft px-5 py-4">
        <h2 id="reading-heading" className="font-semibold">What the numbers say</h2>
        <ul className="mt-1 space-y-1">
          {rateReading(r, settings.ratioMethod, unit).map((t) => (
            <li key={t}>{t}</li>
          ))}
        </ul>
      </section>
      <ResultTable
        caption={`Rates ${unit}`}
        columns={['Group', 'Cases', ptName, `Rate ${unit}`, `${conf} CI, ${r.rateExposed.methods.exact}`, `${conf} CI, ${r.rateExposed.methods.midP}`, `${conf} CI, ${r.rateExposed.methods.byar}`]}
        rows={rateRows}
        exportName="ad-hoc-rates"
      />
      <IntervalPlot
        title={`Incidence rate ratio with its ${conf} intervals`}
        items={[
          { label: 'exact conditional', estimate: r.irr.estimate, ...r.irr.exact },
          { label: 'mid-p exact', estimate: r.irr.estimate, ...r.irr.midP },
          { label: 'Wald (log scale)', estimate: r.irr.estimate, ...r.irr.wald },
        ]}
      />
      <ResultTable caption="Comparison of the exposed with the reference group" columns={['Measure', 'Estimate', `${conf} lower`, `${conf} upper`, 'Method']} rows={measureRows} exportName="ad-hoc-rate-comparison" />
      <ResultTable
        caption="Tests"
        columns={['Hypothesis', 'p', 'Method']}
        rows={tests.map(([key, h, p, m]) => ({ key, cells: [h, formatP(p), m], csv: [h, p, m] }))}
        exportName="ad-hoc-rate-tests"
      />
      <ReasonsList reasons={r.reasons} />
    </div>
  );
}
