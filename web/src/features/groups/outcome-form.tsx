import { countingRuleSchema } from '@ratewarden/shared/domain';
import { outcomeCreateSchema, type ExposureGroupDto, type OutcomeDto } from '@ratewarden/shared/groups';
import { useId, useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { SelectField } from '../../components/form/select-field';
import { TextField } from '../../components/form/text-field';
import { useSaveOutcome } from './api/save-outcome';

export function OutcomeForm({ outcome, groups, onDone }: { outcome: OutcomeDto | null; groups: ExposureGroupDto[]; onDone: () => void }) {
  const save = useSaveOutcome();
  const [code, setCode] = useState(outcome?.code ?? '');
  const [name, setName] = useState(outcome?.name ?? '');
  const [caseDefinition, setCaseDefinition] = useState(outcome?.caseDefinition ?? '');
  const [countingRule, setCountingRule] = useState(outcome?.countingRule ?? 'first_event');
  const [lag, setLag] = useState(String(outcome?.lagMonths ?? 0));
  const [reference, setReference] = useState(outcome?.referenceGroupId ? String(outcome.referenceGroupId) : '');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const defId = useId();
  return (
    <form
      aria-label={outcome ? `Change ${outcome.name}` : 'New outcome'}
      className="mt-3 grid gap-3 form-panel p-3 sm:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = outcomeCreateSchema.safeParse({
          code: outcome?.code ?? code,
          name,
          caseDefinition,
          countingRule,
          lagMonths: Number(lag),
          referenceGroupId: reference ? Number(reference) : null,
        });
        if (!parsed.success) {
          setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
          return;
        }
        setErrors({});
        const { code: c, ...rest } = parsed.data;
        save.mutate(outcome ? { id: outcome.id, body: rest } : { id: null, body: { code: c, ...rest } }, { onSuccess: onDone });
      }}
    >
      {!outcome && <TextField label="Code" hint="as it appears in case files" value={code} onChange={(e) => setCode(e.target.value)} error={errors.code} />}
      <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
      <div className="flex flex-col gap-1 sm:col-span-2">
        <label htmlFor={defId} className="text-sm font-medium">
          Case definition
        </label>
        <textarea
          id={defId}
          rows={3}
          value={caseDefinition}
          onChange={(e) => setCaseDefinition(e.target.value)}
          className="field px-2 py-1.5"
          aria-invalid={errors.caseDefinition ? true : undefined}
        />
        {errors.caseDefinition && <span className="text-sm text-alarm">⚠ {errors.caseDefinition}</span>}
      </div>
      <SelectField
        label="Counting"
        value={countingRule}
        onChange={(e) => setCountingRule(e.target.value as typeof countingRule)}
        options={countingRuleSchema.options.map((r) => ({
          value: r,
          label: r === 'first_event' ? 'First event only (the worker leaves the at-risk time)' : 'Recurrent events',
        }))}
      />
      <TextField label="Exposure lag (months)" inputMode="numeric" value={lag} onChange={(e) => setLag(e.target.value)} error={errors.lagMonths} />
      <SelectField
        label="Reference group"
        value={reference}
        onChange={(e) => setReference(e.target.value)}
        options={[{ value: '', label: 'The global reference group' }, ...groups.map((g) => ({ value: String(g.id), label: g.name }))]}
      />
      {save.isError && (
        <div className="sm:col-span-2">
          <ProblemNotice title="Not saved" problem={problemOf(save.error).problem} />
        </div>
      )}
      <div className="flex gap-3 sm:col-span-2">
        <button type="submit" disabled={save.isPending} className="btn btn-primary px-3 py-1.5 text-sm">
          {outcome ? 'Save the outcome' : 'Create the outcome'}
        </button>
        <button type="button" onClick={onDone} className="btn btn-quiet px-3 py-1.5 text-sm">
          Cancel
        </button>
      </div>
    </form>
  );
}
