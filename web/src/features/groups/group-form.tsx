import { exposureGroupCreateSchema, type ExposureGroupDto } from '@ratewarden/shared/groups';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { TextField } from '../../components/form/text-field';
import { useSaveGroup } from './api/save-group';

/** Create an exposure group, or change one (its code stays: rosters already use it). */
export function GroupForm({ group, onDone }: { group: ExposureGroupDto | null; onDone: () => void }) {
  const save = useSaveGroup();
  const [code, setCode] = useState(group?.code ?? '');
  const [name, setName] = useState(group?.name ?? '');
  const [hazard, setHazard] = useState(group?.hazard ?? '');
  const [level, setLevel] = useState(group?.exposureLevel === null || group?.exposureLevel === undefined ? '' : String(group.exposureLevel));
  const [description, setDescription] = useState(group?.description ?? '');
  const [errors, setErrors] = useState<Record<string, string>>({});
  return (
    <form
      aria-label={group ? `Change ${group.name}` : 'New exposure group'}
      className="mt-3 grid gap-3 form-panel p-3 sm:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = exposureGroupCreateSchema.safeParse({
          code: group?.code ?? code,
          name,
          hazard,
          exposureLevel: level.trim() === '' ? null : Number(level),
          description: description.trim() || null,
        });
        if (!parsed.success) {
          setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
          return;
        }
        setErrors({});
        const { code: c, ...rest } = parsed.data;
        save.mutate(group ? { id: group.id, body: rest } : { id: null, body: { code: c, ...rest } }, { onSuccess: onDone });
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
      {save.isError && (
        <div className="sm:col-span-2">
          <ProblemNotice title="Not saved" problem={problemOf(save.error).problem} />
        </div>
      )}
      <div className="flex gap-3 sm:col-span-2">
        <button type="submit" disabled={save.isPending} className="btn btn-primary px-3 py-1.5 text-sm">
          {group ? 'Save the group' : 'Create the group'}
        </button>
        <button type="button" onClick={onDone} className="btn btn-quiet px-3 py-1.5 text-sm">
          Cancel
        </button>
      </div>
    </form>
  );
}
