/**
 * A state as a word with a left rule (raised, in review, succeeded ...). The colour repeats what
 * the word says and is never the only signal.
 */
export type Tone = 'neutral' | 'attention' | 'alarm' | 'good' | 'muted';

const tones: Record<Tone, string> = {
  neutral: 'border-rule',
  attention: 'border-amber',
  alarm: 'border-brick',
  good: 'border-moss',
  muted: 'border-ink-soft',
};

export function StateTag({ text, tone }: { text: string; tone: Tone }) {
  return <span className={`inline-block border-l-4 bg-paper px-2 py-0.5 text-xs font-semibold uppercase tracking-wide ${tones[tone]}`}>{text}</span>;
}
