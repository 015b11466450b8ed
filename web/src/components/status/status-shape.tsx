/**
 * The shapes of Ratewarden's status family. Each tone has its own shape, so a state reads from the
 * shape and its words before its colour: settled things are round, things asking for attention
 * point (triangle), alarms are diamonds, finished or paused ones are squares. States that fill up
 * over time (reporting periods) use the circle's halves on the way to full.
 */
export type Shape = 'ring' | 'half-left' | 'half-right' | 'disc' | 'square' | 'square-hollow' | 'triangle' | 'diamond';

export type Tone = 'neutral' | 'attention' | 'alarm' | 'good' | 'muted' | 'done';

/** The colour token of each tone (text-strength colours: they pass contrast as text too). */
export const toneColour: Record<Tone, string> = {
  neutral: 'var(--color-ink-soft)',
  attention: 'var(--color-watch)',
  alarm: 'var(--color-alarm)',
  good: 'var(--color-ok)',
  muted: 'var(--color-muted)',
  done: 'var(--color-accent-strong)',
};

/** The pill behind a status word: a tint of the tone. */
export const toneTint: Record<Tone, string> = {
  neutral: 'bg-muted-soft',
  attention: 'bg-watch-soft',
  alarm: 'bg-alarm-soft',
  good: 'bg-ok-soft',
  muted: 'bg-muted-soft',
  done: 'bg-accent-soft',
};

export const toneShape: Record<Tone, Shape> = {
  neutral: 'ring',
  attention: 'triangle',
  alarm: 'diamond',
  good: 'disc',
  muted: 'square-hollow',
  done: 'square',
};

export function StatusShape({ shape, tone, className = 'h-3 w-3' }: { shape: Shape; tone: Tone; className?: string }) {
  const c = toneColour[tone];
  return (
    <svg aria-hidden="true" viewBox="0 0 12 12" className={`inline-block shrink-0 ${className}`}>
      {shape === 'ring' && <circle cx="6" cy="6" r="4.6" fill="none" stroke={c} strokeWidth="1.8" />}
      {shape === 'disc' && <circle cx="6" cy="6" r="5.2" fill={c} />}
      {shape === 'half-left' && (
        <>
          <circle cx="6" cy="6" r="4.6" fill="none" stroke={c} strokeWidth="1.8" />
          <path d="M6 1.4 A4.6 4.6 0 0 0 6 10.6 Z" fill={c} />
        </>
      )}
      {shape === 'half-right' && (
        <>
          <circle cx="6" cy="6" r="4.6" fill="none" stroke={c} strokeWidth="1.8" />
          <path d="M6 1.4 A4.6 4.6 0 0 1 6 10.6 Z" fill={c} />
        </>
      )}
      {shape === 'square' && <rect x="1.2" y="1.2" width="9.6" height="9.6" rx="1.5" fill={c} />}
      {shape === 'square-hollow' && <rect x="1.9" y="1.9" width="8.2" height="8.2" rx="1.5" fill="none" stroke={c} strokeWidth="1.8" />}
      {shape === 'triangle' && <path d="M6 0.8 L11.4 10.9 H0.6 Z" fill={c} />}
      {shape === 'diamond' && <path d="M6 0.4 L11.6 6 L6 11.6 L0.4 6 Z" fill={c} />}
    </svg>
  );
}
