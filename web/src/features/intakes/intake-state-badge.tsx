import type { IntakeState } from '@ratewarden/shared/intake';

/** An intake's state as a word with a left rule; the colour only repeats what the word says. */
const tone: Record<IntakeState, string> = {
  received: 'border-rule',
  checked: 'border-amber',
  applied: 'border-moss',
  rejected: 'border-brick',
  superseded: 'border-ink-soft',
};

export function IntakeStateBadge({ state }: { state: IntakeState }) {
  return <span className={`inline-block border-l-4 bg-paper px-2 py-0.5 text-xs font-semibold uppercase tracking-wide ${tone[state]}`}>{state}</span>;
}
