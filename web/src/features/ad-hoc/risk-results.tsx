import type { RiskComparisonResult } from '@ratewarden/shared/stats';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { ResultTable, type ResultRow } from '../../components/table/result-table';
import { formatConfidence } from '../../components/units/units-strip';
import { formatCount, formatEstimate, formatP, formatPercent } from '../../lib/format';
import { differenceMethodLabels, type DifferenceMethod } from './ad-hoc-settings';
import { DifferencePlot } from './difference-plot';
import { LeadResult } from './lead-result';
import { agreementSentence, differenceMethodsNote, tableTestsNote } from './method-agreement';
import { MethodsFold } from './methods-fold';
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

const differenceMethods: DifferenceMethod[] = ['newcombe', 'miettinenNurminen', 'mee', 'wald'];

/** Percentage points from a proportion: 0.2 → "20.00". */
const points = (x: number | null) => (x === null ? 'not defined' : formatEstimate(x * 100));

/** A fixed cohort's 2×2 table: the risk difference by the preferred method leads; every other method folds below. */
export function RiskResults({ result: r, method }: { result: RiskComparisonResult; method: DifferenceMethod }) {
  const { a, b, c, d } = r.table;
  const conf = formatConfidence(r.confidence);
  const interval = r.rd[method];
  const nntMethod = r.nnt.throughInfinity
    ? `${r.methods.nnt}; the interval runs through infinity (harm from the lower limit, benefit beyond the upper)`
    : r.methods.nnt;
  const otherRows: ResultRow[] = [
    row('rr', 'Risk ratio', r.rr.estimate, r.rr.katz, r.rr.methods.katz),
    row('or-woolf', 'Odds ratio', r.or.estimate, r.or.woolf, r.or.methods.woolf),
    row('or-exact', 'Odds ratio (conditional maximum likelihood)', r.or.exact.estimate, r.or.exact, r.or.methods.exact),
    row('nnt', r.nnt.direction === 'benefit' ? 'Number needed to benefit (negative)' : 'Number needed to harm', r.nnt.estimate, r.nnt, nntMethod),
    row('af-exposed', 'Attributable fraction among the exposed', r.attributable.afExposed.estimate, r.attributable.afExposed, r.attributable.methods.afExposed),
    row(
      'af-population',
      'Attributable fraction in the population',
      r.attributable.afPopulation.estimate,
      r.attributable.afPopulation,
      r.attributable.methods.afPopulation,
    ),
  ];
  const methodRows: ResultRow[] = differenceMethods.map((m) =>
    row(m, `${differenceMethodLabels[m]}${m === method ? ' (preferred)' : ''}`, r.rd.estimate, r.rd[m], r.rd.methods[m]),
  );
  const tests: [string, string, number | null, string, number | null][] = [
    ['chi', 'Chi-square', r.pChiSquare, r.methods.chiSquare, r.chiSquare.chi2],
    ['chi-yates', 'Chi-square, continuity-corrected', r.pChiSquareYates, r.methods.chiSquareYates, r.chiSquareYates.chi2],
    ['fisher', 'Fisher exact', r.pFisher, r.methods.fisher, null],
  ];
  const groups: [string, number, number][] = [
    ['Exposed', a, b],
    ['Not exposed (reference)', c, d],
  ];
  return (
    <div>
      <LeadResult
        measure="Risk difference, exposed minus not exposed"
        method={differenceMethodLabels[method]}
        estimate={points(r.rd.estimate)}
        unit="percentage points"
        interval={`${conf} CI ${points(interval.lower)} to ${points(interval.upper)} percentage points`}
        plot={
          <DifferencePlot title={`Risk difference with its ${conf} interval`} label={differenceMethodLabels[method]} estimate={r.rd.estimate} {...interval} />
        }
        reading={riskReading(r, method)}
      />
      <ResultTable
        caption="The two groups"
        columns={['Group', 'With the outcome', 'Without', 'People', 'Risk']}
        rows={groups.map(([name, cases, non]) => {
          const n = cases + non;
          return {
            key: name,
            cells: [name, formatCount(cases), formatCount(non), formatCount(n), n === 0 ? 'not defined' : formatPercent(cases / n)],
            csv: [name, cases, non, n, n === 0 ? null : cases / n],
          };
        })}
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
      <ResultTable
        caption="Other measures of the comparison"
        columns={['Measure', 'Estimate', `${conf} lower`, `${conf} upper`, 'Method']}
        rows={otherRows}
        exportName="ad-hoc-risk-measures"
      />
      <ReasonsList reasons={r.reasons} />
      <MethodsFold
        summary="Other interval methods and tests, compared"
        notes={[
          differenceMethodsNote,
          agreementSentence(
            differenceMethods.map((m) => r.rd[m]),
            'difference',
            Math.min(a, b, c, d),
          ),
          tableTestsNote,
        ]}
      >
        <ResultTable
          caption="Risk difference by each method"
          columns={['Method', 'Estimate', `${conf} lower`, `${conf} upper`, 'How']}
          rows={methodRows}
          exportName="ad-hoc-risk-difference-methods"
        />
        <ResultTable
          caption="Tests of equal risks"
          columns={['Test', 'Statistic', 'p', 'How']}
          rows={tests.map(([key, name, p, m, stat]) => ({
            key,
            cells: [name, stat === null ? '—' : `χ² = ${formatEstimate(stat)}`, formatP(p), m],
            csv: [name, stat, p, m],
          }))}
          exportName="ad-hoc-risk-tests"
        />
      </MethodsFold>
    </div>
  );
}
