import { useForm } from 'react-hook-form';
import { TextField } from '../../components/form/text-field';
import { zodResolver } from '../../lib/zod-resolver';
import { rateInputSchema, type RateInput, type RateInputText } from './ad-hoc-schemas';
import type { Basis } from './ad-hoc-settings';

/** Cases and person-time of the two groups, each field labelled by whom and what it counts. */
export function RateForm({ basis, onSubmit }: { basis: Basis; onSubmit: (v: RateInput) => void }) {
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<RateInputText, unknown, RateInput>({
    resolver: zodResolver(rateInputSchema),
    defaultValues: { exposed: { cases: '', personTime: '' }, reference: { cases: '', personTime: '' } },
  });
  const ptLabel = basis === 'hours' ? 'hours worked' : 'person-years';
  return (
    <form noValidate onSubmit={handleSubmit(onSubmit)} aria-label="Two groups as cases and person-time" className="grid gap-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <fieldset className="card grid gap-3 p-4">
          <legend className="px-1 font-semibold">Exposed group</legend>
          <TextField
            label="Exposed: cases with the outcome"
            inputMode="numeric"
            autoComplete="off"
            error={errors.exposed?.cases?.message}
            {...register('exposed.cases')}
          />
          <TextField
            label={`Exposed: ${ptLabel} followed`}
            inputMode="decimal"
            autoComplete="off"
            error={errors.exposed?.personTime?.message}
            {...register('exposed.personTime')}
          />
        </fieldset>
        <fieldset className="card grid gap-3 p-4">
          <legend className="px-1 font-semibold">Group not exposed (the reference)</legend>
          <TextField
            label="Not exposed: cases with the outcome"
            inputMode="numeric"
            autoComplete="off"
            error={errors.reference?.cases?.message}
            {...register('reference.cases')}
          />
          <TextField
            label={`Not exposed: ${ptLabel} followed`}
            inputMode="decimal"
            autoComplete="off"
            error={errors.reference?.personTime?.message}
            {...register('reference.personTime')}
          />
        </fieldset>
      </div>
      <div>
        <button type="submit" className="btn btn-primary px-5 py-2">
          Compare the rates
        </button>
      </div>
    </form>
  );
}
