import type { RateComparisonResult, RiskComparisonResult } from '@ratewarden/shared/stats';
import { formatConfidence } from '../../components/units/units-strip';
import { formatEstimate, formatInterval, formatPercent } from '../../lib/format';
import { differenceMethodLabels, ratioMethodLabels, type DifferenceMethod, type RatioMethod } from './ad-hoc-settings';

/**
 * Plain-language readings of a comparison, one sentence per idea, using the same numbers as the
 * tables. They describe the data, never a cause; the cautions say the rest.
 */
function reasonFor(reasons: { field: string; reason: string }[], prefix: string): string {
  return reasons.find((r) => r.field === prefix || r.field.startsWith(`${prefix}.`))?.reason ?? 'the data do not define it';
}

function compatibility(lower: number | null, upper: number | null, nullValue: number, what: string): string {
  if (lower === null || upper === null) return '';
  if (lower <= nullValue && upper >= nullValue) return ` The interval includes ${nullValue}, so the data are compatible with no difference in ${what}.`;
  return ` The interval excludes ${nullValue}.`;
}

export function rateReading(r: RateComparisonResult, method: RatioMethod, unit: string): string[] {
  const conf = formatConfidence(r.confidence);
  const out: string[] = [];
  const irr = r.irr.estimate;
  if (irr === null) {
    out.push(`The rate ratio cannot be computed: ${reasonFor(r.reasons, 'irr')}.`);
  } else {
    const interval = r.irr[method];
    const direction =
      irr === Infinity
        ? 'there are cases only in the exposed group, so the ratio is infinite'
        : irr < 1
          ? 'lower, not higher'
          : irr > 1
            ? 'higher'
            : 'the same';
    out.push(
      `The rate in the exposed group is ${formatEstimate(irr)} times the rate in the reference group (${direction}; ${conf} CI ${formatInterval(interval)}, ${ratioMethodLabels[method]}).` +
        compatibility(interval.lower, interval.upper, 1, 'rates'),
    );
  }
  const ird = r.ird.estimate;
  if (ird === null) out.push(`The rate difference cannot be computed: ${reasonFor(r.reasons, 'ird')}.`);
  else {
    const word = ird >= 0 ? 'more' : 'fewer';
    out.push(
      `In absolute terms the exposed group has ${formatEstimate(Math.abs(ird))} ${word} cases ${unit} than the reference group (${conf} CI ${formatInterval(r.ird.wald)}, Wald).`,
    );
  }
  if (r.excessCases !== null && r.excessCases > 0) {
    out.push(`At the reference rate about ${formatEstimate(r.excessCases)} of the exposed cases would not have been expected.`);
  }
  return out;
}

export function riskReading(r: RiskComparisonResult, method: DifferenceMethod): string[] {
  const conf = formatConfidence(r.confidence);
  const out: string[] = [];
  const rr = r.rr.estimate;
  if (rr === null) out.push(`The risk ratio cannot be computed: ${reasonFor(r.reasons, 'rr')}.`);
  else {
    out.push(
      `The risk in the exposed group is ${formatEstimate(rr)} times the risk in the reference group (${conf} CI ${formatInterval(r.rr.katz)}, Katz log).` +
        compatibility(r.rr.katz.lower, r.rr.katz.upper, 1, 'risks'),
    );
  }
  const rd = r.rd.estimate;
  if (rd !== null) {
    out.push(
      `The risks differ by ${formatPercent(Math.abs(rd))} of the people in each group, ${rd >= 0 ? 'higher' : 'lower'} among the exposed (${conf} CI ${formatPercent(r.rd[method].lower)} to ${formatPercent(r.rd[method].upper)} for exposed minus reference, ${differenceMethodLabels[method]}).`,
    );
  }
  const nnt = r.nnt;
  if (nnt.estimate !== null && nnt.direction) {
    const n = formatEstimate(Math.abs(nnt.estimate));
    out.push(
      nnt.direction === 'harm'
        ? `That is about one additional case for every ${n} people exposed (number needed to harm)${nnt.throughInfinity ? '; the interval runs through infinity, so no additional case at all is also compatible with the data' : ''}.`
        : `That is about one case fewer for every ${n} people exposed (number needed to benefit)${nnt.throughInfinity ? '; the interval runs through infinity, so no difference at all is also compatible with the data' : ''}.`,
    );
  }
  return out;
}
