import { useForm } from 'react-hook-form';
import { TextField } from '../../components/form/text-field';
import { zodResolver } from '../../lib/zod-resolver';
import { tableInputSchema, type TableInput, type TableInputText } from './ad-hoc-schemas';

/** The 2×2 table laid out as it is usually written: exposure in rows, outcome in columns. */
export function TableForm({ onSubmit }: { onSubmit: (v: TableInput) => void }) {
  const { register, handleSubmit, formState: { errors } } = useForm<TableInputText, unknown, TableInput>({
    resolver: zodResolver(tableInputSchema),
    defaultValues: { a: '', b: '', c: '', d: '' },
  });
  return (
    <form noValidate onSubmit={handleSubmit(onSubmit)} aria-label="Two-by-two table of counts" className="grid gap-4">
      <div className="grid max-w-2xl grid-cols-[auto_1fr_1fr] items-start gap-3 bg-panel p-4">
        <span />
        <span className="text-sm font-semibold">Cases (with the outcome)</span>
        <span className="text-sm font-semibold">Non-cases</span>
        <span className="pt-7 text-sm font-semibold">Exposed</span>
        <TextField label="a: exposed cases" inputMode="numeric" autoComplete="off" error={errors.a?.message} {...register('a')} />
        <TextField label="b: exposed non-cases" inputMode="numeric" autoComplete="off" error={errors.b?.message} {...register('b')} />
        <span className="pt-7 text-sm font-semibold">Reference</span>
        <TextField label="c: reference cases" inputMode="numeric" autoComplete="off" error={errors.c?.message} {...register('c')} />
        <TextField label="d: reference non-cases" inputMode="numeric" autoComplete="off" error={errors.d?.message} {...register('d')} />
      </div>
      <div>
        <button type="submit" className="rounded-sm bg-moss px-5 py-2 font-medium text-white hover:bg-ink">
          Compare the risks
        </button>
      </div>
    </form>
  );
}
