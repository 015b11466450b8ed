import { StatusShape, toneShape, toneTint, type Shape, type Tone } from './status-shape';

export type { Tone } from './status-shape';

/**
 * A state as shape + words on a tinted pill (raised, in review, succeeded, applied ...): the one
 * component every status in the app is drawn with. The colour repeats what the shape and the word
 * say and is never the only signal.
 */
export function StateTag({ text, tone, shape }: { text: string; tone: Tone; shape?: Shape }) {
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full px-2.5 py-0.5 text-xs font-semibold text-ink ${toneTint[tone]}`}>
      <StatusShape shape={shape ?? toneShape[tone]} tone={tone} className="h-2.5 w-2.5" />
      {text}
    </span>
  );
}
