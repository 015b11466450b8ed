import { useForm } from 'react-hook-form';
import { TextField } from '../../components/form/text-field';
import { zodResolver } from '../../lib/zod-resolver';
import { rateInputSchema, type RateInput, type RateInputText } from './ad-hoc-schemas';
import type { Basis } from './ad-hoc-settings';

export function RateForm({ basis, onSubmit }: { basis: Basis; onSubmit: (v: RateInput) => void }) {
  const { register, handleSubmit, formState: { errors } } = useForm<RateInputText, unknown, RateInput>({
    resolver: zodResolver(rateInputSchema),
    defaultValues: { exposed: { cases: '', personTime: '' }, reference: { cases: '', personTime: '' } },
  });
  const ptLabel = basis === 'hours' ? 'hours worked' : 'person-years';
  return (
    <form noValidate onSubmit={handleSubmit(onSubmit)} aria-label="Two groups as cases and person-time" className="grid gap-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <fieldset className="grid gap-3 border-l-4 border-amber bg-panel p-4">
          <legend className="font-semibold">Exposed group</legend>
          <TextField label="Exposed group: cases" inputMode="numeric" autoComplete="off" error={errors.exposed?.cases?.message} {...register('exposed.cases')} />
          <TextField label={`Exposed group: ${ptLabel}`} inputMode="decimal" autoComplete="off" error={errors.exposed?.personTime?.message} {...register('exposed.personTime')} />
        </fieldset>
        <fieldset className="grid gap-3 border-l-4 border-moss bg-panel p-4">
          <legend className="font-semibold">Reference group</legend>
          <TextField label="Reference group: cases" inputMode="numeric" autoComplete="off" error={errors.reference?.cases?.message} {...register('reference.cases')} />
          <TextField label={`Reference group: ${ptLabel}`} inputMode="decimal" autoComplete="off" error={errors.reference?.personTime?.message} {...register('reference.personTime')} />
        </fieldset>
      </div>
      <div>
        <button type="submit" className="rounded-sm bg-moss px-5 py-2 font-medium text-white hover:bg-ink">
          Compare the rates
        </button>
      </div>
    </form>
  );
}
