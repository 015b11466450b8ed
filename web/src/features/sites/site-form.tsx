import { siteCreateSchema, type SiteDto } from '@ratewarden/shared/groups';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { TextField } from '../../components/form/text-field';
import { useSaveSite } from './api/save-site';

/** Create a site, or rename one (its code stays: roster and case files already carry it). */
export function SiteForm({ site, onDone }: { site: SiteDto | null; onDone: () => void }) {
  const save = useSaveSite();
  const [code, setCode] = useState(site?.code ?? '');
  const [name, setName] = useState(site?.name ?? '');
  const [region, setRegion] = useState(site?.region ?? '');
  const [errors, setErrors] = useState<Record<string, string>>({});
  return (
    <form
      aria-label={site ? `Rename ${site.name}` : 'New site'}
      className="mt-3 grid gap-3 form-panel p-3 sm:grid-cols-3"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = siteCreateSchema.safeParse({ code: site?.code ?? code, name, region: region.trim() || null });
        if (!parsed.success) {
          setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
          return;
        }
        setErrors({});
        const { code: c, ...rest } = parsed.data;
        save.mutate(site ? { id: site.id, body: rest } : { id: null, body: { code: c, ...rest } }, { onSuccess: onDone });
      }}
    >
      {!site && (
        <TextField label="Code" hint="as it appears in roster and case files" value={code} onChange={(e) => setCode(e.target.value)} error={errors.code} />
      )}
      <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
      <TextField label="Region" hint="optional" value={region} onChange={(e) => setRegion(e.target.value)} error={errors.region} />
      {save.isError && (
        <div className="sm:col-span-3">
          <ProblemNotice title="Not saved" problem={problemOf(save.error).problem} />
        </div>
      )}
      <div className="flex gap-3 sm:col-span-3">
        <button type="submit" disabled={save.isPending} className="btn btn-primary px-3 py-1.5 text-sm">
          {site ? 'Save the name' : 'Create the site'}
        </button>
        <button type="button" onClick={onDone} className="btn btn-quiet px-3 py-1.5 text-sm">
          Cancel
        </button>
      </div>
    </form>
  );
}
