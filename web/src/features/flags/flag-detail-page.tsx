import { roleMay } from '@ratewarden/shared/permissions';
import type { SessionUser } from '@ratewarden/shared/session';
import { Link } from 'react-router';
import { Cautions } from '../../components/cautions/cautions';
import { PrintButton } from '../../components/layout/print-button';
import { StateTag } from '../../components/status/state-tag';
import { ResultTable } from '../../components/table/result-table';
import { UnitsStrip } from '../../components/units/units-strip';
import { paths } from '../../config/paths';
import { formatMonth, formatWhen } from '../../lib/dates';
import { formatAmount, formatEstimate, formatP } from '../../lib/format';
import { toNumber } from '../../lib/json-number';
import { exportCount, showCount } from '../../lib/small-cells';
import { useOutcomes } from '../../api/get-outcomes';
import { useRun } from '../../api/get-run';
import { useFlag } from './api/get-flag';
import { FlagCases } from './flag-cases';
import { FlagNotes } from './flag-notes';
import { FlagDecisionForm } from './flag-decision-form';
import { closeReasonLabels, eventLabels, flagStateLabels, measureLabels, thresholdOnLabels } from './flag-labels';

export function FlagDetailPage({ id, user }: { id: string; user: SessionUser }) {
  const { data: flag } = useFlag(id);
  const { data: outcomes } = useOutcomes();
  const f = flag.figures;
  const outcome = outcomes.find((o) => o.id === flag.outcomeId);
  const run = useRun(f.runId);
  const cases = showCount(f.cases, user.role, undefined, f.withheld ?? f.suppressed ?? false);
  const hidden = cases.suppressed;
  const perText = f.personTimeBasis === 'person_years' ? `per ${formatAmount(f.per)} person-years` : `per ${formatAmount(f.per * 200_000)} hours worked`;
  const measureUnit = f.measure === 'irr' ? '' : ` ${perText}`;
  const figureRows: Array<[string, string, string | number | null]> = [
    ['Measure', measureLabels[f.measure], measureLabels[f.measure]],
    ['Compared', thresholdOnLabels[f.thresholdOn], f.thresholdOn],
    ['Threshold', `${formatEstimate(f.threshold)}${measureUnit}`, f.threshold],
    ['Value that crossed it', hidden ? 'not shown (small count)' : `${formatEstimate(f.value)}${measureUnit}`, hidden ? null : f.value],
    [
      'Estimate (interval)',
      hidden
        ? 'not shown (small count)'
        : `${formatEstimate(toNumber(f.estimate))} (${formatEstimate(toNumber(f.lower))} to ${formatEstimate(toNumber(f.upper))})`,
      hidden ? null : toNumber(f.estimate),
    ],
    ['Cases', cases.text, exportCount(f.cases, user.role, undefined, f.withheld ?? f.suppressed ?? false)],
    ['Expected at the reference rate', hidden || f.expected === null ? '—' : formatEstimate(f.expected), hidden ? null : f.expected],
    ['Person-time', `${formatAmount(f.personTime)} ${f.personTimeBasis === 'person_years' ? 'person-years' : 'units of 200,000 h'}`, f.personTime],
    ['p', hidden ? '—' : formatP(f.p), hidden ? null : f.p],
    ['q (false discovery rate)', hidden ? '—' : formatP(f.q), hidden ? null : f.q],
    ['Site', flag.siteName ? `${flag.siteName} (its own results)` : 'Whole company', flag.siteName ?? 'whole company'],
    [
      'Period',
      `${f.window === 'rolling12' ? 'twelve months ending ' : ''}${formatMonth(f.period)}${f.completeness === 'complete' ? ', complete' : f.completeness === 'partial' ? ', partial (a roster or case list was not in when the run read it)' : ''}`,
      f.period,
    ],
  ];
  return (
    <section>
      <p className="text-sm">
        <Link className="text-accent underline" to={paths.flags}>
          ← All flags
        </Link>
      </p>
      <h1 className="mt-2 flex flex-wrap items-center gap-3 text-2xl font-bold tracking-tight">
        {flag.exposureGroupName}: {outcome?.name ?? `outcome ${flag.outcomeId}`}
        {flag.siteName ? ` at ${flag.siteName}` : ''}
        <StateTag {...flagStateLabels[flag.state]} />
      </h1>
      <div className="mt-2">
        <PrintButton what="this flag" />
      </div>
      <p className="mt-2 text-ink-soft">
        Raised {formatWhen(flag.raisedAt)} by the watch rule{' '}
        <Link className="font-medium text-accent underline" to={paths.rule(flag.ruleId)}>
          {flag.ruleName}
        </Link>
        {flag.crossing ? '; the latest run still finds it past the rule.' : '; the latest run no longer finds it past the rule.'}
      </p>
      {flag.state === 'closed' && (
        <div className="mt-4 note note-plain px-4 py-3">
          <p className="font-semibold">
            Closed {formatWhen(flag.closedAt)}: {flag.closeReason ? closeReasonLabels[flag.closeReason] : 'no reason'}
          </p>
          {flag.closeComment && <p className="mt-1">{flag.closeComment}</p>}
        </div>
      )}
      <div className="mt-4">
        {run.data && (
          <UnitsStrip
            settings={{
              basis: f.personTimeBasis === 'person_years' ? 'person-years (2,000 h = 1 person-year)' : 'units of 200,000 hours worked',
              multiplier: perText,
              confidence: run.data.settings.confidence,
              settingsVersion: run.data.settingsVersion,
              intervalMethod: f.measure === 'ird' ? 'Wald' : f.measure === 'rate' ? 'exact Poisson' : 'exact conditional',
            }}
          />
        )}
      </div>
      <ResultTable
        caption="The numbers that triggered the flag (latest run)"
        columns={['Figure', 'Value']}
        exportName={`flag-${flag.id}-figures`}
        rows={figureRows.map(([k, v, csv]) => ({ key: k, cells: [k, v], csv: [k, csv] }))}
      />
      <ResultTable
        caption="Decision history"
        columns={['When', 'What', 'Run', 'Note']}
        exportName={`flag-${flag.id}-history`}
        rows={flag.events.map((e) => {
          const note = [
            e.detail.reason ? closeReasonLabels[e.detail.reason as keyof typeof closeReasonLabels] : null,
            typeof e.detail.comment === 'string' ? e.detail.comment : null,
          ]
            .filter(Boolean)
            .join(': ');
          return {
            key: e.id,
            cells: [formatWhen(e.at), eventLabels[e.kind], e.runId ? e.runId.slice(0, 8) : '—', note || '—'],
            csv: [e.at, e.kind, e.runId, note],
          };
        })}
      />
      {flag.notices.length > 0 && (
        <ResultTable
          caption="Threshold notices"
          columns={['Recipient', 'State', 'Attempts', 'Sent']}
          rows={flag.notices.map((n) => ({
            key: n.id,
            cells: [n.recipient, n.state, String(n.attempts), formatWhen(n.sentAt)],
            csv: [n.recipient, n.state, n.attempts, n.sentAt],
          }))}
        />
      )}
      {roleMay(user.role, 'flags:review') && <FlagDecisionForm flag={flag} />}
      {roleMay(user.role, 'cases:read') && <FlagCases flagId={flag.id} />}
      {roleMay(user.role, 'cases:read') && <FlagNotes flagId={flag.id} />}
      <Cautions />
    </section>
  );
}
