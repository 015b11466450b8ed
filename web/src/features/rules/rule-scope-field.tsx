import type { SiteDto } from '@ratewarden/shared/groups';

/** Where a rule looks: the company's results, or each chosen site's own. */
export interface RuleScope {
  scope: 'company' | 'sites';
  siteIds: number[];
}

/**
 * The rule form's scope: the whole company (only for a person who reads every site, since the
 * company's figures hold every site's workers) or chosen sites, among the person's own. Sites of
 * a stored rule the person does not have stay listed, checked and fixed.
 */
export function RuleScopeField({
  value,
  onChange,
  sites,
  mySiteIds,
  error,
}: {
  value: RuleScope;
  onChange: (v: RuleScope) => void;
  sites: SiteDto[];
  mySiteIds: number[];
  error?: string;
}) {
  const everySite = sites.every((s) => mySiteIds.includes(s.id));
  const listed = sites.filter((s) => mySiteIds.includes(s.id) || value.siteIds.includes(s.id));
  const errorId = 'rule-scope-error';
  return (
    <fieldset className="sm:col-span-2" aria-describedby={error ? errorId : undefined}>
      <legend className="text-sm font-medium">Watches</legend>
      <div className="mt-1 flex flex-col gap-1">
        <label className="flex items-center gap-2 text-sm">
          <input
            type="radio"
            name="rule-scope"
            value="company"
            checked={value.scope === 'company'}
            disabled={!everySite}
            onChange={() => onChange({ ...value, scope: 'company' })}
          />
          The whole company, on the company's results
          {!everySite && <span className="text-ink-soft">(needs access to every site)</span>}
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" name="rule-scope" value="sites" checked={value.scope === 'sites'} onChange={() => onChange({ ...value, scope: 'sites' })} />
          Chosen sites, each on its own results
        </label>
      </div>
      {value.scope === 'sites' && (
        <fieldset className="mt-2 ml-6">
          <legend className="text-sm font-medium">Sites watched</legend>
          <div className="mt-1 flex flex-wrap gap-3">
            {listed.map((s) => (
              <label key={s.id} className="flex items-center gap-1.5 text-sm">
                <input
                  type="checkbox"
                  checked={value.siteIds.includes(s.id)}
                  disabled={!mySiteIds.includes(s.id)}
                  onChange={(e) => onChange({ ...value, siteIds: e.target.checked ? [...value.siteIds, s.id] : value.siteIds.filter((x) => x !== s.id) })}
                />
                {s.name}
              </label>
            ))}
          </div>
        </fieldset>
      )}
      {error && (
        <p id={errorId} role="alert" className="mt-1 text-sm text-alarm">
          {error}
        </p>
      )}
    </fieldset>
  );
}
