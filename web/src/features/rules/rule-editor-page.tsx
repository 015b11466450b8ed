import { roleMay } from '@ratewarden/shared/permissions';
import {
  fdrFamilySentence,
  ruleMeasureSchema,
  ruleWindowSchema,
  thresholdOnSchema,
  watchRuleSchemas,
  type WatchRule,
  type WatchRuleInput,
} from '@ratewarden/shared/rules';
import { windowLabels } from '@ratewarden/shared/windows';
import type { SessionUser } from '@ratewarden/shared/session';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { SelectField } from '../../components/form/select-field';
import { TextField } from '../../components/form/text-field';
import { paths } from '../../config/paths';
import { smallCellThreshold } from '../../lib/small-cells';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useSites } from '../../api/get-sites';
import { useDeleteRule, useSaveRule } from './api/save-rule';
import { describeRule } from './describe-rule';
import { RuleScopeField, type RuleScope } from './rule-scope-field';

interface Draft extends RuleScope {
  name: string;
  outcomeId: string;
  exposureGroupId: string;
  measure: WatchRule['measure'];
  thresholdOn: WatchRule['thresholdOn'];
  threshold: string;
  window: WatchRule['window'];
  minCases: string;
  minExpected: string;
  consecutivePeriods: string;
  fdrControl: boolean;
  fdrLevel: string;
  recipients: string;
  active: boolean;
}

const measureOptions = {
  irr: 'Rate ratio (IRR) against the reference',
  ird: 'Rate difference (IRD) against the reference',
  rate: "The group's own rate",
  uchart: 'u-chart: a month above the upper limit',
  sir: 'SIR against the reference rates (exact lower limit or estimate)',
} as const;

/** A new rule watches the company for a reader of every site, else every site of the person's. */
function draftOf(r: WatchRule | null, outcomeId: number | undefined, everySite: boolean, mySiteIds: number[]): Draft {
  return {
    name: r?.name ?? '',
    outcomeId: String(r?.outcomeId ?? outcomeId ?? ''),
    exposureGroupId: r?.exposureGroupId ? String(r.exposureGroupId) : '',
    scope: r ? (r.siteIds === null ? 'company' : 'sites') : everySite ? 'company' : 'sites',
    siteIds: r ? (r.siteIds ?? []) : everySite ? [] : [...mySiteIds],
    measure: r?.measure ?? 'irr',
    thresholdOn: r?.thresholdOn ?? 'lower_bound',
    threshold: r?.threshold === null || r?.threshold === undefined ? (r ? '' : '1') : String(r.threshold),
    window: r?.window ?? 'rolling12',
    minCases: String(r?.minCases ?? smallCellThreshold()),
    minExpected: String(r?.minExpected ?? 0),
    consecutivePeriods: String(r?.consecutivePeriods ?? 1),
    fdrControl: r?.fdrControl ?? true,
    fdrLevel: String(r?.fdrLevel ?? 0.05),
    recipients: r?.recipients.join(', ') ?? '',
    active: r?.active ?? true,
  };
}

const numOrNull = (s: string) => (s.trim() === '' ? null : Number(s));

function inputOf(d: Draft): unknown {
  return {
    name: d.name,
    outcomeId: Number(d.outcomeId),
    exposureGroupId: d.exposureGroupId ? Number(d.exposureGroupId) : null,
    siteIds: d.scope === 'company' ? null : d.siteIds,
    measure: d.measure,
    thresholdOn: d.thresholdOn,
    threshold: d.measure === 'uchart' ? null : numOrNull(d.threshold),
    window: d.measure === 'uchart' ? 'month' : d.window,
    minCases: Number(d.minCases),
    minExpected: Number(d.minExpected),
    consecutivePeriods: Number(d.consecutivePeriods),
    fdrControl: d.fdrControl,
    fdrLevel: Number(d.fdrLevel),
    recipients: d.recipients.split(/[,\s]+/).filter(Boolean),
    active: d.active,
  };
}

/** Create or change a watch rule; the same zod schema as the server checks it before it is sent. */
export function RuleEditorPage({ rule, user }: { rule: WatchRule | null; user: SessionUser }) {
  const { data: outcomes } = useOutcomes();
  const { data: groups } = useGroups();
  const { data: sites } = useSites();
  const everySite = sites.every((s) => user.siteIds.includes(s.id));
  const [d, setD] = useState<Draft>(() => draftOf(rule, outcomes[0]?.id, everySite, user.siteIds));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useSaveRule();
  const remove = useDeleteRule();
  const navigate = useNavigate();
  // The server's rule: a company-wide rule is written by readers of every site, a site rule by people with each of its sites.
  const mayScope = rule === null || (rule.siteIds === null ? everySite : rule.siteIds.every((id) => user.siteIds.includes(id)));
  const canWrite = roleMay(user.role, 'rules:write') && mayScope;
  const set = <K extends keyof Draft>(k: K, v: Draft[K]) => setD((x) => ({ ...x, [k]: v }));
  // The server's threshold (from the session): a rule may not select on counts that are withheld.
  const parsed = watchRuleSchemas(smallCellThreshold()).input.safeParse(inputOf(d));

  function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!parsed.success) {
      const errs: Record<string, string> = {};
      for (const i of parsed.error.issues) errs[String(i.path[0] ?? 'root')] ??= i.message;
      setErrors(errs);
      return;
    }
    setErrors({});
    save.mutate({ id: rule?.id ?? null, body: parsed.data as WatchRuleInput }, { onSuccess: () => navigate(paths.rules) });
  }

  return (
    <section className="max-w-4xl">
      <p className="text-sm">
        <Link className="text-accent underline" to={paths.rules}>
          ← All watch rules
        </Link>
      </p>
      <h1 className="mt-2 text-2xl font-bold tracking-tight">{rule ? rule.name : 'New watch rule'}</h1>
      {parsed.success && (
        <p className="mt-2 note note-ok px-3 py-2" aria-live="polite">
          Raises a flag for {d.exposureGroupId ? groups.find((g) => String(g.id) === d.exposureGroupId)?.name : 'any group but the reference'}
          {d.scope === 'company'
            ? ' in the whole company'
            : ` at ${d.siteIds.length === 1 ? 'a site' : 'any chosen site'}, on that site's own results,`} when {describeRule(parsed.data)}.
        </p>
      )}
      {save.isError && (
        <div className="mt-3">
          <ProblemNotice title="The rule was not saved" problem={problemOf(save.error).problem} />
        </div>
      )}
      <form onSubmit={submit} className="mt-5 grid gap-4 card p-4 sm:grid-cols-2" aria-label="Watch rule">
        <fieldset disabled={!canWrite} className="contents">
          <TextField label="Name" value={d.name} onChange={(e) => set('name', e.target.value)} error={errors.name} />
          <SelectField
            label="Outcome"
            value={d.outcomeId}
            onChange={(e) => set('outcomeId', e.target.value)}
            options={outcomes.map((o) => ({ value: String(o.id), label: o.name }))}
          />
          <SelectField
            label="Exposure group"
            value={d.exposureGroupId}
            onChange={(e) => set('exposureGroupId', e.target.value)}
            options={[
              { value: '', label: 'Every group but the reference' },
              ...groups.filter((g) => !g.isReference).map((g) => ({ value: String(g.id), label: g.name })),
            ]}
          />
          <RuleScopeField value={d} onChange={(v) => setD((x) => ({ ...x, ...v }))} sites={sites} mySiteIds={user.siteIds} error={errors.siteIds} />
          <SelectField
            label="Measure"
            value={d.measure}
            onChange={(e) => set('measure', e.target.value as Draft['measure'])}
            options={ruleMeasureSchema.options.map((m) => ({ value: m, label: measureOptions[m] }))}
          />
          {d.measure !== 'uchart' && (
            <>
              <SelectField
                label="Compare"
                value={d.thresholdOn}
                onChange={(e) => set('thresholdOn', e.target.value as Draft['thresholdOn'])}
                options={thresholdOnSchema.options.map((t) => ({ value: t, label: t === 'lower_bound' ? 'The lower bound of the interval' : 'The estimate' }))}
              />
              <TextField
                label="Threshold"
                hint={d.measure === 'irr' || d.measure === 'sir' ? 'a ratio, e.g. 1 or 1.5' : "in the run's rate units"}
                inputMode="decimal"
                value={d.threshold}
                onChange={(e) => set('threshold', e.target.value)}
                error={errors.threshold}
              />
              <SelectField
                label="Window"
                value={d.window}
                onChange={(e) => set('window', e.target.value as Draft['window'])}
                options={ruleWindowSchema.options.map((w) => ({ value: w, label: windowLabels[w] })).reverse()}
              />
              <p className="self-end text-xs text-ink-soft">
                Rules read single months or rolling 12 months; calendar quarters, calendar years and the whole period are for reading results.
              </p>
            </>
          )}
          <TextField label="Minimum cases" inputMode="numeric" value={d.minCases} onChange={(e) => set('minCases', e.target.value)} error={errors.minCases} />
          <TextField
            label="Minimum expected cases"
            inputMode="decimal"
            value={d.minExpected}
            onChange={(e) => set('minExpected', e.target.value)}
            error={errors.minExpected}
          />
          <TextField
            label="Consecutive periods"
            inputMode="numeric"
            value={d.consecutivePeriods}
            onChange={(e) => set('consecutivePeriods', e.target.value)}
            error={errors.consecutivePeriods}
          />
          {d.measure !== 'uchart' && (
            <>
              <label className="flex items-center gap-2 self-end">
                <input type="checkbox" checked={d.fdrControl} onChange={(e) => set('fdrControl', e.target.checked)} />
                <span className="text-sm font-medium">Control the false discovery rate across groups (Benjamini–Hochberg)</span>
              </label>
              <TextField
                label="False discovery rate"
                inputMode="decimal"
                value={d.fdrLevel}
                onChange={(e) => set('fdrLevel', e.target.value)}
                error={errors.fdrLevel}
                disabled={!d.fdrControl}
              />
              <p className="text-sm text-ink-soft sm:col-span-2">{fdrFamilySentence(d.scope === 'company' ? null : d.siteIds)}</p>
            </>
          )}
          <div className="sm:col-span-2">
            <TextField
              label="Recipients of threshold notices"
              hint="e-mail addresses, separated by commas; the physician is always told"
              value={d.recipients}
              onChange={(e) => set('recipients', e.target.value)}
              error={errors.recipients}
            />
          </div>
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={d.active} onChange={(e) => set('active', e.target.checked)} />
            <span className="text-sm font-medium">Active (checked after every run)</span>
          </label>
          {errors.root && (
            <p role="alert" className="text-sm text-alarm sm:col-span-2">
              {errors.root}
            </p>
          )}
          {errors.window && (
            <p role="alert" className="text-sm text-alarm sm:col-span-2">
              {errors.window}
            </p>
          )}
          {canWrite && (
            <div className="flex flex-wrap gap-3 sm:col-span-2">
              <button type="submit" disabled={save.isPending} className="btn btn-primary px-4 py-2">
                {save.isPending ? 'Saving …' : rule ? 'Save the rule' : 'Create the rule'}
              </button>
              {rule && (
                <button
                  type="button"
                  disabled={remove.isPending}
                  onClick={() => {
                    if (window.confirm(`Delete the watch rule "${rule.name}"? Its flags keep their history.`))
                      remove.mutate(rule.id, { onSuccess: () => navigate(paths.rules) });
                  }}
                  className="btn btn-danger px-4 py-2"
                >
                  Delete the rule
                </button>
              )}
            </div>
          )}
        </fieldset>
      </form>
      {remove.isError && (
        <div className="mt-3">
          <ProblemNotice title="The rule was not deleted" problem={problemOf(remove.error).problem} />
        </div>
      )}
      {!roleMay(user.role, 'rules:write') && (
        <p className="mt-3 text-sm text-ink-soft">Your role may read watch rules; the hygienist and the safety manager change them.</p>
      )}
      {roleMay(user.role, 'rules:write') && !mayScope && (
        <p className="mt-3 text-sm text-ink-soft">
          This rule watches {rule?.siteIds === null ? 'the whole company' : 'sites'} beyond your access; a person with access to{' '}
          {rule?.siteIds === null ? 'every site' : 'each of its sites'} changes it.
        </p>
      )}
    </section>
  );
}
