import { useState, type FormEvent, type ReactNode } from 'react';
import type { ZodType } from 'zod';
import { ProblemNotice } from '../feedback/problem-notice';
import { problemOf } from '../feedback/route-error';

/** A save in flight, as TanStack Query's useMutation gives it. */
interface SaveState {
  isPending: boolean;
  isError: boolean;
  error: unknown;
}

/**
 * Checks a form's values with the schema the server also applies (shared/), keeping each field's
 * first message for display beside it; `check` returns the parsed values, or null after a problem.
 */
export function useSchemaCheck<Out>(schema: ZodType<Out>) {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const check = (values: unknown): Out | null => {
    const parsed = schema.safeParse(values);
    if (!parsed.success) {
      const first: Record<string, string> = {};
      for (const i of parsed.error.issues) first[String(i.path[0])] ??= i.message;
      setErrors(first);
      return null;
    }
    setErrors({});
    return parsed.data;
  };
  return { errors, check };
}

/**
 * A record's code is given once, when it is created (files already carry it); a change sends the
 * other fields only. Returns the mutation's argument for a new record or for `record`.
 */
export function createOrChange<Body extends { code: string }>(record: { id: number } | null, body: Body) {
  const { code, ...rest } = body;
  return record ? { id: record.id, body: rest } : { id: null, body: { code, ...rest } };
}

/**
 * The frame of the administration forms (sites, exposure groups, outcomes): the panel, the
 * server's problem when a save fails, and the submit and cancel buttons, keyboard-usable.
 */
export function RecordForm({
  label,
  columns,
  save,
  submitLabel,
  onSubmit,
  onCancel,
  children,
}: {
  label: string;
  columns: 2 | 3;
  save: SaveState;
  submitLabel: string;
  onSubmit: () => void;
  onCancel: () => void;
  children: ReactNode;
}) {
  const span = columns === 2 ? 'sm:col-span-2' : 'sm:col-span-3';
  return (
    <form
      aria-label={label}
      className={`mt-3 grid gap-3 form-panel p-3 ${columns === 2 ? 'sm:grid-cols-2' : 'sm:grid-cols-3'}`}
      onSubmit={(e: FormEvent) => {
        e.preventDefault();
        onSubmit();
      }}
    >
      {children}
      {save.isError && (
        <div className={span}>
          <ProblemNotice title="Not saved" problem={problemOf(save.error).problem} />
        </div>
      )}
      <div className={`flex gap-3 ${span}`}>
        <button type="submit" disabled={save.isPending} className="btn btn-primary px-3 py-1.5 text-sm">
          {submitLabel}
        </button>
        <button type="button" onClick={onCancel} className="btn btn-quiet px-3 py-1.5 text-sm">
          Cancel
        </button>
      </div>
    </form>
  );
}
