import type { RiskComparisonResult } from '@ratewarden/shared/stats';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { ResultTable, type ResultRow } from '../../components/table/result-table';
import { formatCount, formatEstimate, formatP, formatPercent } from '../../lib/format';
import { ReasonsList } from './reasons-list';
import { riskReading } from './reading';

type Limits = { lower: number | null; upper: number | null };

function row(key: string, name: string, estimate: number | null, limits: Limits | null, method: string): ResultRow {
  return {
    key,
    cells: [name, formatEstimate(estimate), limits ? formatEstimate(limits.lower) : '—', limits ? formatEstimate(limits.upper) : '—', method],
    csv: [name, estimate, limits?.lower ?? null, limits?.upper ?? null, method],
  };
}

export function RiskResults({ result: r }: { result: RiskComparisonResult }) {
  const { a, b, c, d } = r.table;
  const conf = `${Number((r.confidence * 100).toFixed(2))}%`;
  const nntMethod = r.nnt.throughInfinity ? `${r.methods.nnt}; the interval runs through infinity (harm from the lower limit, benefit beyond the upper)` : r.methods.nnt;
  const rows: ResultRow[] = [
    row('rd-newcombe', 'Risk difference', r.rd.estimate, r.rd.newcombe, r.rd.methods.newcombe),
    row('rd-mn', 'Risk difference', r.rd.estimate, r.rd.miettinenNurminen, r.rd.methods.miettinenNurminen),
    row('rd-mee', 'Risk difference', r.rd.estimate, r.rd.mee, r.rd.methods.mee),
    row('rd-wald', 'Risk difference', r.rd.estimate, r.rd.wald, r.rd.methods.wald),
    row('rr', 'Risk ratio', r.rr.estimate, r.rr.katz, r.rr.methods.katz),
    row('or-woolf', 'Odds ratio', r.or.estimate, r.or.woolf, r.or.methods.woolf),
    row('or-exact', 'Odds ratio (conditional maximum likelihood)', r.or.exact.estimate, r.or.exact, r.or.methods.exact),
    row('nnt', r.nnt.direction === 'benefit' ? 'Number needed to benefit (negative)' : 'Number needed to harm', r.nnt.estimate, r.nnt, nntMethod),
    row('af-exposed', 'Attributable fraction among the exposed', r.attributable.afExposed.estimate, r.attributable.afExposed, r.attributable.methods.afExposed),
    row('af-population', 'Attributable fraction in the population', r.attributable.afPopulation.estimate, r.attributable.afPopulation, r.attributable.methods.afPopulation),
  ];
  const tests: [string, string, number | null, string, number | null][] = [
    ['chi', 'No association (risks equal)', r.pChiSquare, r.methods.chiSquare, r.chiSquare.chi2],
    ['chi-yates', 'No association (risks equal)', r.pChiSquareYates, r.methods.chiSquareYates, r.chiSquareYates.chi2],
    ['fisher', 'No association (risks equal)', r.pFisher, r.methods.fisher, null],
  ];
  const groups: [string, number, number][] = [
    ['Exposed', a, a + b],
    ['Reference', c, c + d],
  ];
  return (
    <div>
      <section aria-labelledby="reading-heading" className="border-l-4 border-moss bg-moss-soft px-5 py-4">
        <h2 id="reading-heading" className="font-semibold">What the numbers say</h2>
        <ul className="mt-1 space-y-1">
          {riskReading(r).map((t) => (
            <li key={t}>{t}</li>
          ))}
        </ul>
      </section>
      <ResultTable
        caption="Risks"
        columns={['Group', 'Cases', 'People', 'Risk']}
        rows={groups.map(([name, cases, n]) => ({ key: name, cells: [name, formatCount(cases), formatCount(n), n === 0 ? 'not defined' : formatPercent(cases / n)], csv: [name, cases, n, n === 0 ? null : cases / n] }))}
        exportName="ad-hoc-risks"
      />
      <IntervalPlot
        title={`Risk ratio and odds ratios with their ${conf} intervals`}
        valueLabel="Ratio (log scale)"
        items={[
          { label: 'risk ratio (Katz)', estimate: r.rr.estimate, ...r.rr.katz },
          { label: 'odds ratio (Woolf)', estimate: r.or.estimate, ...r.or.woolf },
          { label: 'odds ratio (exact)', ...r.or.exact },
        ]}
      />
      <ResultTable caption="Comparison of the exposed with the reference group" columns={['Measure', 'Estimate', `${conf} lower`, `${conf} upper`, 'Method']} rows={rows} exportName="ad-hoc-risk-comparison" />
      <ResultTable
        caption="Tests"
        columns={['Hypothesis', 'Statistic', 'p', 'Method']}
        rows={tests.map(([key, h, p, m, stat]) => ({ key, cells: [h, stat === null ? '—' : `χ² = ${formatEstimate(stat)}`, formatP(p), m], csv: [h, stat, p, m] }))}
        exportName="ad-hoc-risk-tests"
      />
      <ReasonsList reasons={r.reasons} />
    </div>
  );
}
