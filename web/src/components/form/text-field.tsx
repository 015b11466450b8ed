import { useId, type InputHTMLAttributes } from 'react';

/** A labelled input with its hint and error tied to it for assistive technology. */
export function TextField({ label, hint, error, ...input }: { label: string; hint?: string; error?: string } & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      {hint && (
        <span id={hintId} className="text-xs text-ink-soft">
          {hint}
        </span>
      )}
      <input id={id} aria-invalid={error ? true : undefined} aria-describedby={describedBy} className="field px-2 py-1.5 font-mono tabular-nums" {...input} />
      {error && (
        <span id={errorId} className="text-sm text-alarm">
          <span aria-hidden="true">⚠ </span>
          {error}
        </span>
      )}
    </div>
  );
}
