import type { PendingRunAnswer } from '@ratewarden/shared/runs';

const clock = (iso: string) => new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });

/**
 * Says when the requested run comes: runs after uploads wait until none has come for a few
 * minutes (so a roster and its case list give one run); the run button's does not wait.
 */
export function PendingRunNote({ pending }: { pending: PendingRunAnswer['pending'] | undefined }) {
  if (!pending) return null;
  const due = new Date(pending.dueAt).getTime() <= Date.now();
  return (
    <p role="status" className="mt-3 note note-watch px-4 py-2 text-sm">
      <span aria-hidden="true">◔ </span>
      {pending.immediate || due
        ? 'A run has been asked for; the worker takes it up within seconds.'
        : `Run scheduled after uploads settle, at ${clock(pending.dueAt)} (a later upload moves it on, so a roster and its case list give one run).`}
    </p>
  );
}
