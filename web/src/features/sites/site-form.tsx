import { siteCreateSchema, type SiteDto } from '@ratewarden/shared/groups';
import { useState } from 'react';
import { createOrChange, RecordForm, useSchemaCheck } from '../../components/form/record-form';
import { TextField } from '../../components/form/text-field';
import { useSaveSite } from './api/save-site';

/** Create a site, or rename one (its code stays: roster and case files already carry it). */
export function SiteForm({ site, onDone }: { site: SiteDto | null; onDone: () => void }) {
  const save = useSaveSite();
  const { errors, check } = useSchemaCheck(siteCreateSchema);
  const [code, setCode] = useState(site?.code ?? '');
  const [name, setName] = useState(site?.name ?? '');
  const [region, setRegion] = useState(site?.region ?? '');
  return (
    <RecordForm
      label={site ? `Rename ${site.name}` : 'New site'}
      columns={3}
      save={save}
      submitLabel={site ? 'Save the name' : 'Create the site'}
      onCancel={onDone}
      onSubmit={() => {
        const parsed = check({ code: site?.code ?? code, name, region: region.trim() || null });
        if (parsed) save.mutate(createOrChange(site, parsed), { onSuccess: onDone });
      }}
    >
      {!site && (
        <TextField label="Code" hint="as it appears in roster and case files" value={code} onChange={(e) => setCode(e.target.value)} error={errors.code} />
      )}
      <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
      <TextField label="Region" hint="optional" value={region} onChange={(e) => setRegion(e.target.value)} error={errors.region} />
    </RecordForm>
  );
}
