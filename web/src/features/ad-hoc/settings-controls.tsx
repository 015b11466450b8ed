import { SelectField } from '../../components/form/select-field';
import { confidenceChoices } from './ad-hoc-schemas';
import {
  differenceMethodLabels,
  perChoices,
  ratioMethodLabels,
  type AdHocSettings,
  type Basis,
  type DifferenceMethod,
  type RatioMethod,
} from './ad-hoc-settings';

export function SettingsControls({ mode, settings, onChange }: { mode: 'rates' | 'table'; settings: AdHocSettings; onChange: (s: AdHocSettings) => void }) {
  return (
    <fieldset className="card grid gap-4 p-4 sm:grid-cols-2 lg:grid-cols-4">
      <legend className="px-1 text-sm font-semibold">Settings (remembered on this device)</legend>
      {mode === 'rates' && (
        <>
          <SelectField
            label="Person-time entered as"
            value={settings.basis}
            onChange={(e) => {
              const basis = e.target.value as Basis;
              onChange({ ...settings, basis, per: perChoices[basis][0]!.value });
            }}
            options={[
              { value: 'person-years', label: 'Person-years' },
              { value: 'hours', label: 'Hours worked' },
            ]}
          />
          <SelectField
            label="Show rates"
            value={String(settings.per)}
            onChange={(e) => onChange({ ...settings, per: Number(e.target.value) })}
            options={perChoices[settings.basis].map((c) => ({ value: String(c.value), label: c.label }))}
          />
        </>
      )}
      <SelectField
        label="Confidence level"
        value={String(settings.confidence)}
        onChange={(e) => onChange({ ...settings, confidence: Number(e.target.value) })}
        options={confidenceChoices.map((c) => ({ value: c, label: `${Number(c) * 100}%` }))}
      />
      {mode === 'rates' ? (
        <SelectField
          label="Preferred rate-ratio interval"
          value={settings.ratioMethod}
          onChange={(e) => onChange({ ...settings, ratioMethod: e.target.value as RatioMethod })}
          options={Object.entries(ratioMethodLabels).map(([value, label]) => ({ value, label }))}
        />
      ) : (
        <SelectField
          label="Preferred risk-difference interval"
          value={settings.differenceMethod}
          onChange={(e) => onChange({ ...settings, differenceMethod: e.target.value as DifferenceMethod })}
          options={Object.entries(differenceMethodLabels).map(([value, label]) => ({ value, label }))}
        />
      )}
    </fieldset>
  );
}
