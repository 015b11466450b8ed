import type { RuleMeasure, ThresholdOn, WindowKind } from '@ratewarden/shared/rules';
import type { RunSettings } from '@ratewarden/shared/runs';

export interface NoticeFacts {
  flagId: string;
  kind: 'raised' | 'escalated';
  ruleName: string;
  measure: RuleMeasure;
  thresholdOn: ThresholdOn;
  threshold: number | null;
  window: WindowKind;
  period: string;
  groupCode: string;
  groupName: string;
  value: number;
  estimate: number | null;
  lower: number | null;
  upper: number | null;
  cases: number;
  expected: number | null;
  personTime: number;
  settings: RunSettings;
  appUrl: string;
  /**
   * The count is small and the recipient is not a physician: the count and every figure computed
   * from it are left out (as the app withholds them), so the notice says only that the rule was crossed.
   */
  withholdFigures?: { threshold: number };
}

const measureWords: Record<RuleMeasure, string> = {
  irr: 'incidence rate ratio against the reference group',
  ird: 'incidence rate difference against the reference group',
  rate: 'incidence rate of the group',
  uchart: 'u-chart point against its upper control limit',
};

function num(x: number | null, digits = 2): string {
  if (x === null) return 'not defined';
  if (!Number.isFinite(x)) return x > 0 ? 'infinite' : '-infinite';
  return x.toLocaleString('en-GB', { maximumFractionDigits: digits, minimumFractionDigits: Math.min(digits, 2) });
}

function unit(settings: RunSettings): string {
  return settings.personTimeBasis === 'person_years'
    ? `per ${num(settings.per, 0)} person-years (2,000 hours = 1 person-year)`
    : `per ${num(settings.per * 200_000, 0)} hours worked`;
}

/**
 * The text of a threshold notice. By design it names the rule and the exposure group and gives
 * aggregate figures and a sign-in link only: no outcome or diagnosis, no worker identifier, no
 * case-level detail (those stay behind the physician's sign-in).
 */
export function composeNotice(f: NoticeFacts): { subject: string; text: string } {
  const verb = f.kind === 'raised' ? 'raised a flag' : 'flag worsened';
  const subject = `Ratewarden: watch rule "${f.ruleName}" ${verb} for ${f.groupName}`;
  const pct = Math.round(f.settings.confidence * 100);
  const periodWords = f.window === 'month' ? `month of ${f.period.slice(0, 7)}` : `12 months ending ${f.period.slice(0, 7)}`;
  const compared = f.measure === 'uchart' ? 'the u-chart point over its upper control limit' : f.thresholdOn === 'estimate' ? 'the estimate' : `the lower ${pct}% bound`;
  const lines = [
    f.kind === 'raised' ? 'A watch rule in Ratewarden has been crossed.' : 'An open flag in Ratewarden has worsened past its watch rule.',
    '',
    `Watch rule: ${f.ruleName}`,
    `Exposure group: ${f.groupName} (${f.groupCode})`,
    `Period: ${periodWords}`,
    `Measure: ${measureWords[f.measure]}; compared: ${compared}`,
    f.measure === 'uchart' ? 'Threshold: the upper control limit' : `Threshold: above ${num(f.threshold)}`,
    ...(f.withholdFigures
      ? [`Cases in the group: fewer than ${f.withholdFigures.threshold}; the value and the figures computed from it are withheld here, as in the app (the occupational physician sees them)`]
      : [
          f.measure === 'uchart'
            ? `Value: ${num(f.value)} times the upper control limit`
            : `Value: ${num(f.value)} (estimate ${num(f.estimate)}, ${pct}% interval ${num(f.lower)} to ${num(f.upper)})`,
          `Cases in the group: ${f.cases}; expected at the reference rate: ${num(f.expected, 1)}`,
        ]),
    `Person-time: ${num(f.personTime, 1)} ${f.settings.personTimeBasis === 'person_years' ? 'person-years' : 'units of 200,000 hours'}; rates ${unit(f.settings)}`,
    '',
    `Sign in to review the flag: ${f.appUrl.replace(/\/$/, '')}/flags/${f.flagId}`,
    '',
    'This notice carries aggregate figures only. A flag is a prompt for review by qualified people, not a diagnosis or proof of cause.',
  ];
  return { subject, text: lines.join('\n') };
}
