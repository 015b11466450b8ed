import { formatCount, formatFigure, NOT_DEFINED } from '@ratewarden/shared/number-format';
import type { Completeness } from '@ratewarden/shared/periods';
import type { RuleMeasure, ThresholdOn, RuleWindow } from '@ratewarden/shared/rules';
import type { RunSettings } from '@ratewarden/shared/runs';

/**
 * What a notice is about: a flag raised or worsened past its worst (threshold notices), or a
 * follow-up when a later run withdraws a worsening (`eased`), finds the flag no longer past its
 * rule (`cleared`), or past it again after that (`crossed_again`).
 */
export type NoticeKind = 'raised' | 'escalated' | 'eased' | 'cleared' | 'crossed_again';

export interface NoticeFacts {
  flagId: string;
  kind: NoticeKind;
  ruleName: string;
  measure: RuleMeasure;
  thresholdOn: ThresholdOn;
  threshold: number | null;
  window: RuleWindow;
  period: string;
  /** Whether the period was complete in the flag's scope when the run read it. */
  completeness: Completeness;
  groupCode: string;
  groupName: string;
  /** The site whose own results the flag is about; null: the whole company. */
  site: { code: string; name: string } | null;
  /** The measure's value in this run; null when it is not defined (a cleared flag's may not be). */
  value: number | null;
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
   * from it are left out (as the app withholds them), so the notice says only what happened.
   */
  withholdFigures?: { threshold: number };
}

const measureWords: Record<RuleMeasure, string> = {
  irr: 'incidence rate ratio against the reference group',
  ird: 'incidence rate difference against the reference group',
  rate: 'incidence rate of the group',
  uchart: 'u-chart point against its upper control limit',
  sir: 'standardized incidence ratio against the external reference rates (over all the person-time they cover; the healthy-worker effect biases it downwards)',
};

/** Subject words and the opening sentence of each kind. */
const kindWords: Record<NoticeKind, { subject: string; opening: string }> = {
  raised: { subject: 'raised a flag', opening: 'A watch rule in Ratewarden has been crossed.' },
  escalated: { subject: 'flag worsened', opening: 'An open flag in Ratewarden has worsened past its watch rule.' },
  eased: {
    subject: 'follow-up, worsening withdrawn',
    opening:
      'Follow-up: a later run no longer supports the worsening reported earlier for this flag. Its value is back at or below its level before that worsening; the flag is still past its watch rule and stays open.',
  },
  cleared: {
    subject: 'follow-up, no longer past the rule',
    opening: 'Follow-up: a later run finds this flag no longer past its watch rule. The flag stays open until a person reviews and closes it.',
  },
  crossed_again: { subject: 'flag past the rule again', opening: 'An open flag that a run had found below its watch rule is past the rule again.' },
};

/** Every figure in a notice reads as it does in the app: the one number rule. */
function num(x: number | null): string {
  if (x === null) return NOT_DEFINED;
  if (!Number.isFinite(x)) return x > 0 ? 'infinite' : '-infinite';
  return formatFigure(x);
}

function unit(settings: RunSettings): string {
  return settings.personTimeBasis === 'person_years'
    ? `per ${formatCount(settings.per)} person-years (2,000 hours = 1 person-year)`
    : `per ${formatCount(settings.per * 200_000)} hours worked`;
}

/** "Dec 2031" for 2031-12-01. */
function monthWords(period: string): string {
  return new Date(`${period.slice(0, 7)}-01T00:00:00Z`).toLocaleString('en-GB', { month: 'short', year: 'numeric', timeZone: 'UTC' });
}

/** The period and its completeness as a notice states it, e.g. "12 months ending Dec 2031, complete". */
export function periodText(window: RuleWindow, period: string, completeness: Completeness): string {
  const span = window === 'month' ? `month of ${monthWords(period)}` : `12 months ending ${monthWords(period)}`;
  return completeness === 'complete' ? `${span}, complete` : `${span}, partial (a roster or case list of the period was not in when the run read it)`;
}

/**
 * The e-mail of a notice: only that there is one, and the link to it in the recipient's inbox.
 * No rule, group, site, period or figure: the notice itself is read after signing in.
 */
export function composeMail(kind: NoticeKind, noticeId: string, appUrl: string): { subject: string; text: string } {
  const followUp = kind === 'eased' || kind === 'cleared';
  const subject = followUp ? 'Ratewarden: a follow-up notice for you' : 'Ratewarden: a new threshold notice for you';
  const text = [
    followUp ? 'There is a follow-up on a flag you were told about.' : 'A watch rule in Ratewarden has been crossed, or an open flag has changed.',
    '',
    `Sign in to read the notice in your inbox: ${appUrl.replace(/\/$/, '')}/notices/${noticeId}`,
    '',
    'The notice is kept in Ratewarden, not in this e-mail.',
  ].join('\n');
  return { subject, text };
}

/**
 * The text of a threshold notice or a follow-up, as the inbox shows it. By design it names the rule, the exposure group
 * and the scope and gives aggregate figures of this run and a sign-in link only: no outcome or
 * diagnosis, no worker identifier, no case-level detail, no figure of an earlier run (those stay
 * behind the sign-in).
 */
export function composeNotice(f: NoticeFacts): { subject: string; text: string } {
  const words = kindWords[f.kind];
  const where = f.site ? ` at ${f.site.name}` : '';
  const subject = `Ratewarden: watch rule "${f.ruleName}" ${words.subject} for ${f.groupName}${where}`;
  const pct = Math.round(f.settings.confidence * 100);
  const compared =
    f.measure === 'uchart' ? 'the u-chart point over its upper control limit' : f.thresholdOn === 'estimate' ? 'the estimate' : `the lower ${pct}% bound`;
  const lines = [
    words.opening,
    '',
    `Watch rule: ${f.ruleName}`,
    `Exposure group: ${f.groupName} (${f.groupCode})`,
    f.site ? `Site: ${f.site.name} (${f.site.code}), on this site's own results` : 'Scope: the whole company',
    `Period: ${periodText(f.window, f.period, f.completeness)}`,
    `Measure: ${measureWords[f.measure]}; compared: ${compared}`,
    f.measure === 'uchart' ? 'Threshold: the upper control limit' : `Threshold: above ${num(f.threshold)}`,
    ...(f.withholdFigures
      ? [
          `Cases in the group: fewer than ${f.withholdFigures.threshold}; the value and the figures computed from it are withheld here, as in the app (the occupational physician sees them)`,
        ]
      : [
          f.measure === 'uchart'
            ? `Value: ${num(f.value)} times the upper control limit`
            : `Value: ${num(f.value)} (estimate ${num(f.estimate)}, ${pct}% interval ${num(f.lower)} to ${num(f.upper)})`,
          `Cases in the group: ${f.cases}; expected at the reference rate: ${num(f.expected)}`,
        ]),
    `Person-time: ${num(f.personTime)} ${f.settings.personTimeBasis === 'person_years' ? 'person-years' : 'units of 200,000 hours'}; rates ${unit(f.settings)}`,
    '',
    `Sign in to review the flag: ${f.appUrl.replace(/\/$/, '')}/flags/${f.flagId}`,
    '',
    'This notice carries aggregate figures only. A flag is a prompt for review by qualified people, not a diagnosis or proof of cause.',
  ];
  return { subject, text: lines.join('\n') };
}
