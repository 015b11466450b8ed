/**
 * The standing cautions of DESIGN.md, shown wherever numbers are shown: a "Reading these figures"
 * card under the figures, every caution in view (on screen and in print), in two columns where
 * the page is wide enough.
 */
export const cautionItems = [
  { id: 'cause', text: 'An association in surveillance data is not proof of cause.' },
  { id: 'small', text: 'Small numbers give wide intervals: read the interval, not only the estimate.' },
  { id: 'hwe', text: 'The healthy-worker effect biases comparisons with the general population.' },
  { id: 'flags', text: 'Flags are prompts for review by qualified people, not diagnoses.' },
  { id: 'medical', text: 'Medical decisions belong to a licensed occupational physician, under local law and regulations, which take precedence.' },
] as const;

export function Cautions({ extra }: { extra?: string[] }) {
  return (
    <aside aria-label="Cautions" className="cautions card mt-8 px-5 py-4 text-sm">
      <h2 className="flex items-center gap-2 text-sm font-bold text-accent-strong">
        <svg aria-hidden="true" viewBox="0 0 12 12" className="h-3 w-3">
          <circle cx="6" cy="6" r="4.6" fill="none" stroke="currentColor" strokeWidth="1.8" />
          <circle cx="6" cy="6" r="1.6" fill="currentColor" />
        </svg>
        Reading these figures
      </h2>
      <ul className="mt-2 grid gap-x-8 gap-y-1.5 text-ink-soft md:grid-cols-2">
        {[...cautionItems.map((c) => c.text), ...(extra ?? [])].map((t) => (
          <li key={t} className="flex gap-2">
            <span aria-hidden="true" className="mt-[0.55em] h-1 w-3 shrink-0 rounded-full bg-line" />
            {t}
          </li>
        ))}
      </ul>
    </aside>
  );
}
