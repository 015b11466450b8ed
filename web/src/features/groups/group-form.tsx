import { exposureGroupCreateSchema, type ExposureGroupDto } from '@ratewarden/shared/groups';
import { useState } from 'react';
import { createOrChange, RecordForm, useSchemaCheck } from '../../components/form/record-form';
import { TextField } from '../../components/form/text-field';
import { useSaveGroup } from './api/save-group';

/** Create an exposure group, or change one (its code stays: rosters already use it). */
export function GroupForm({ group, onDone }: { group: ExposureGroupDto | null; onDone: () => void }) {
  const save = useSaveGroup();
  const { errors, check } = useSchemaCheck(exposureGroupCreateSchema);
  const [code, setCode] = useState(group?.code ?? '');
  const [name, setName] = useState(group?.name ?? '');
  const [hazard, setHazard] = useState(group?.hazard ?? '');
  const [level, setLevel] = useState(group?.exposureLevel === null || group?.exposureLevel === undefined ? '' : String(group.exposureLevel));
  const [description, setDescription] = useState(group?.description ?? '');
  return (
    <RecordForm
      label={group ? `Change ${group.name}` : 'New exposure group'}
      columns={2}
      save={save}
      submitLabel={group ? 'Save the group' : 'Create the group'}
      onCancel={onDone}
      onSubmit={() => {
        const parsed = check({
          code: group?.code ?? code,
          name,
          hazard,
          exposureLevel: level.trim() === '' ? null : Number(level),
          description: description.trim() || null,
        });
        if (parsed) save.mutate(createOrChange(group, parsed), { onSuccess: onDone });
      }}
    >
      {!group && <TextField label="Code" hint="as it appears in roster files" value={code} onChange={(e) => setCode(e.target.value)} error={errors.code} />}
      <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
      <TextField label="Hazard" value={hazard} onChange={(e) => setHazard(e.target.value)} error={errors.hazard} />
      <TextField
        label="Exposure level"
        hint="0 unexposed, higher is more exposed; empty leaves the group out of trend tests"
        inputMode="numeric"
        value={level}
        onChange={(e) => setLevel(e.target.value)}
        error={errors.exposureLevel}
      />
      <div className="sm:col-span-2">
        <TextField label="Description" value={description} onChange={(e) => setDescription(e.target.value)} error={errors.description} />
      </div>
    </RecordForm>
  );
}
