import { roleLabels, roleSchema, type Role } from '@ratewarden/shared/domain';
import type { SiteDto } from '@ratewarden/shared/groups';
import { SelectField } from '../../components/form/select-field';

/** A role and a set of sites: the access the administrator gives a person. */
export interface Access {
  role: Role | null;
  siteIds: number[];
}

export function UserAccessFields({ value, onChange, sites, legend }: { value: Access; onChange: (a: Access) => void; sites: SiteDto[]; legend: string }) {
  return (
    <fieldset className="flex flex-wrap items-start gap-6">
      <legend className="sr-only">{legend}</legend>
      <SelectField
        label="Role"
        value={value.role ?? ''}
        onChange={(e) => onChange({ ...value, role: e.target.value ? (e.target.value as Role) : null })}
        options={[{ value: '', label: 'No role (cannot see anything)' }, ...roleSchema.options.map((r) => ({ value: r, label: roleLabels[r] }))]}
      />
      <fieldset>
        <legend className="text-sm font-medium">Sites</legend>
        <div className="mt-1 flex flex-wrap gap-3">
          {sites.map((s) => (
            <label key={s.id} className="flex items-center gap-1.5 text-sm">
              <input
                type="checkbox"
                checked={value.siteIds.includes(s.id)}
                onChange={(e) => onChange({ ...value, siteIds: e.target.checked ? [...value.siteIds, s.id] : value.siteIds.filter((x) => x !== s.id) })}
              />
              {s.name}
            </label>
          ))}
        </div>
      </fieldset>
    </fieldset>
  );
}
