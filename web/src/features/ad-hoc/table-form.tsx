import { useForm } from 'react-hook-form';
import { TextField } from '../../components/form/text-field';
import { zodResolver } from '../../lib/zod-resolver';
import { tableInputSchema, type TableInput, type TableInputText } from './ad-hoc-schemas';

const cells = [
  { name: 'exposedWith', label: 'Exposed, with the outcome' },
  { name: 'exposedWithout', label: 'Exposed, without the outcome' },
  { name: 'unexposedWith', label: 'Not exposed, with the outcome' },
  { name: 'unexposedWithout', label: 'Not exposed, without the outcome' },
] as const;

/**
 * The 2×2 table entered by meaning: each field says whom it counts, in reading order (exposed then
 * not exposed; with then without the outcome), so Tab walks the table row by row. On a wide screen
 * the fields sit as the table; on a phone they stack, each still saying whom it counts.
 */
export function TableForm({ onSubmit }: { onSubmit: (v: TableInput) => void }) {
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<TableInputText, unknown, TableInput>({
    resolver: zodResolver(tableInputSchema),
    defaultValues: { exposedWith: '', exposedWithout: '', unexposedWith: '', unexposedWithout: '' },
  });
  return (
    <form noValidate onSubmit={handleSubmit(onSubmit)} aria-label="Counts of people by exposure and outcome" className="grid gap-4">
      <fieldset className="card grid max-w-2xl gap-4 p-4 sm:grid-cols-2">
        <legend className="px-1 font-semibold">People followed for the same period, by exposure and outcome</legend>
        {cells.map((c) => (
          <TextField
            key={c.name}
            label={c.label}
            hint="number of people"
            inputMode="numeric"
            autoComplete="off"
            error={errors[c.name]?.message}
            {...register(c.name)}
          />
        ))}
      </fieldset>
      <div>
        <button type="submit" className="btn btn-primary px-5 py-2">
          Compare the risks
        </button>
      </div>
    </form>
  );
}
