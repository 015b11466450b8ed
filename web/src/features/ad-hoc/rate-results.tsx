import type { RateComparisonResult } from '@ratewarden/shared/stats';
import { IntervalPlot } from '../../components/charts/interval-plot';
import { ResultTable, type ResultRow } from '../../components/table/result-table';
import { formatConfidence } from '../../components/units/units-strip';
import { formatAmount, formatCount, formatEstimate, formatInterval, formatP, formatPercent } from '../../lib/format';
import type { RateInput } from './ad-hoc-schemas';
import { perUnit, rateIntervalFor, ratioMethodLabels, ratioPFor, type AdHocSettings, type RatioMethod } from './ad-hoc-settings';
import { LeadResult } from './lead-result';
import { agreementSentence, ratioMethodsNote } from './method-agreement';
import { MethodsFold } from './methods-fold';
import { ReasonsList } from './reasons-list';
import { rateReading } from './reading';

type Limits = { lower: number | null; upper: number | null };

function measureRow(key: string, name: string, estimate: number | null, limits: Limits | null, p: number | null, method: string, asPercent = false): ResultRow {
  const f = asPercent ? formatPercent : formatEstimate;
  return {
    key,
    cells: [name, f(estimate), limits ? f(limits.lower) : '—', limits ? f(limits.upper) : '—', p === null ? '—' : formatP(p), method],
    csv: [name, estimate, limits?.lower ?? null, limits?.upper ?? null, p, method],
  };
}

const ratioMethods: RatioMethod[] = ['exact', 'midP', 'wald'];

/** Rates of two groups: the rate ratio by the preferred method leads; every other method folds below. */
export function RateResults({ input, result: r, settings }: { input: RateInput; result: RateComparisonResult; settings: AdHocSettings }) {
  const unit = perUnit(settings);
  const conf = formatConfidence(r.confidence);
  const method = settings.ratioMethod;
  const interval = r.irr[method];
  const p = r.irr[ratioPFor[method]];
  const rateMethod = rateIntervalFor[method];
  const ptName = settings.basis === 'hours' ? 'Hours worked' : 'Person-years';
  const groups: [string, RateInput['exposed'], RateComparisonResult['rateExposed']][] = [
    ['Exposed', input.exposed, r.rateExposed],
    ['Not exposed (reference)', input.reference, r.rateReference],
  ];

  const groupRows: ResultRow[] = groups.map(([name, g, rate]) => ({
    key: name,
    cells: [name, formatCount(g.cases), formatAmount(g.personTime), formatEstimate(rate.estimate), formatInterval(rate[rateMethod])],
    csv: [name, g.cases, g.personTime, rate.estimate, rate[rateMethod].lower, rate[rateMethod].upper],
  }));
  const otherRows: ResultRow[] = [
    measureRow('ird', `Rate difference ${unit}`, r.ird.estimate, r.ird.wald, r.ird.p, `${r.ird.methods.wald}; p by the Wald z test`),
    measureRow('af-exposed', 'Attributable fraction among the exposed', r.afExposed.estimate, r.afExposed, null, r.methods.afExposed, true),
    measureRow('af-population', 'Attributable fraction in the population', r.afPopulation, null, null, r.methods.afPopulation, true),
    measureRow('excess', 'Excess cases in the exposed group', r.excessCases, null, null, 'observed − expected at the reference rate'),
  ];

  const methodRows: ResultRow[] = [
    ...ratioMethods.map((m) => {
      const name = `${ratioMethodLabels[m]}${m === method ? ' (preferred)' : ''}`;
      const pm = r.irr[ratioPFor[m]];
      const how = `${r.irr.methods[m]}; p ${r.irr.methods[ratioPFor[m]]}`;
      return {
        key: m,
        cells: [name, formatEstimate(r.irr.estimate), formatEstimate(r.irr[m].lower), formatEstimate(r.irr[m].upper), formatP(pm), how],
        csv: [name, r.irr.estimate, r.irr[m].lower, r.irr[m].upper, pm, how],
      };
    }),
    ...(
      [
        ['p-exact-ml', 'exact, minimum-likelihood rule (test only)', r.irr.pExactMinLikelihood, r.irr.methods.pExactMinLikelihood],
        ['p-score', 'score (test only)', r.irr.pScore, r.irr.methods.pScore],
      ] as const
    ).map(([key, name, pm, how]) => ({ key, cells: [name, '—', '—', '—', formatP(pm), how], csv: [name, null, null, null, pm, how] })),
  ];
  const rateMethodRows: ResultRow[] = groups.flatMap(([name, , rate]) =>
    (['exact', 'midP', 'byar'] as const).map((m) => ({
      key: `${name}-${m}`,
      cells: [
        `${name}, ${rate.methods[m]}${m === rateMethod ? ' (preferred)' : ''}`,
        formatEstimate(rate.estimate),
        formatEstimate(rate[m].lower),
        formatEstimate(rate[m].upper),
      ],
      csv: [`${name}, ${rate.methods[m]}`, rate.estimate, rate[m].lower, rate[m].upper],
    })),
  );
  const fewest = Math.min(input.exposed.cases, input.reference.cases);

  return (
    <div>
      <LeadResult
        measure="Rate ratio, exposed over not exposed"
        method={ratioMethodLabels[method]}
        estimate={formatEstimate(r.irr.estimate)}
        interval={`${conf} CI ${formatInterval(interval)}`}
        detail={p === null ? undefined : `p = ${formatP(p)} for no difference in rates (${r.irr.methods[ratioPFor[method]]})`}
        plot={
          <IntervalPlot title={`Rate ratio with its ${conf} interval`} items={[{ label: ratioMethodLabels[method], estimate: r.irr.estimate, ...interval }]} />
        }
        reading={rateReading(r, method, unit)}
      />
      <ResultTable
        caption={`The two groups, rates ${unit}`}
        columns={['Group', 'Cases', ptName, `Rate ${unit}`, `${conf} CI, ${r.rateExposed.methods[rateMethod]}`]}
        rows={groupRows}
        exportName="ad-hoc-rates"
      />
      <ResultTable
        caption="Other measures of the comparison"
        columns={['Measure', 'Estimate', `${conf} lower`, `${conf} upper`, 'p', 'Method']}
        rows={otherRows}
        exportName="ad-hoc-rate-measures"
      />
      <ReasonsList reasons={r.reasons} />
      <MethodsFold
        summary="Other interval methods, compared"
        notes={[
          ratioMethodsNote,
          agreementSentence(
            ratioMethods.map((m) => r.irr[m]),
            'ratio',
            fewest,
          ),
        ]}
      >
        <IntervalPlot
          title={`Rate ratio by each method, ${conf} intervals`}
          items={ratioMethods.map((m) => ({ label: ratioMethodLabels[m], estimate: r.irr.estimate, ...r.irr[m] }))}
        />
        <ResultTable
          caption="Rate ratio by each method"
          columns={['Method', 'Estimate', `${conf} lower`, `${conf} upper`, 'p, no difference', 'How']}
          rows={methodRows}
          exportName="ad-hoc-rate-ratio-methods"
        />
        <ResultTable
          caption={`Each group's rate by each method, ${unit}`}
          columns={['Group and method', 'Rate', `${conf} lower`, `${conf} upper`]}
          rows={rateMethodRows}
          exportName="ad-hoc-rate-methods"
        />
      </MethodsFold>
    </div>
  );
}
