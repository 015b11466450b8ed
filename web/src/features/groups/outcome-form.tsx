import { countingRuleSchema } from '@ratewarden/shared/domain';
import { outcomeCreateSchema, type ExposureGroupDto, type OutcomeDto } from '@ratewarden/shared/groups';
import { useId, useState } from 'react';
import { createOrChange, RecordForm, useSchemaCheck } from '../../components/form/record-form';
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
  const { errors, check } = useSchemaCheck(outcomeCreateSchema);
  const defId = useId();
  return (
    <RecordForm
      label={outcome ? `Change ${outcome.name}` : 'New outcome'}
      columns={2}
      save={save}
      submitLabel={outcome ? 'Save the outcome' : 'Create the outcome'}
      onCancel={onDone}
      onSubmit={() => {
        const parsed = check({
          code: outcome?.code ?? code,
          name,
          caseDefinition,
          countingRule,
          lagMonths: Number(lag),
          referenceGroupId: reference ? Number(reference) : null,
        });
        if (parsed) save.mutate(createOrChange(outcome, parsed), { onSuccess: onDone });
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
    </RecordForm>
  );
}
