/**
 * The standing cautions of DESIGN.md, shown wherever numbers are shown. Compact by default (one
 * line under the figures) so the numbers stay on top; the full list opens on request and prints.
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
    <aside aria-label="Cautions" className="cautions mt-6 border-l-4 border-amber bg-amber-soft px-4 py-3 text-sm">
      <details className="print:hidden">
        <summary className="cursor-pointer font-semibold">
          Read with care: association is not cause; small numbers give wide intervals; flags are prompts for review.
        </summary>
        <ul className="mt-2 list-disc space-y-1 pl-5">
          {cautionItems.map((c) => (
            <li key={c.id}>{c.text}</li>
          ))}
          {extra?.map((t) => <li key={t}>{t}</li>)}
        </ul>
      </details>
      <ul className="hidden list-disc space-y-0.5 pl-5 print:block">
        {cautionItems.map((c) => (
          <li key={c.id}>{c.text}</li>
        ))}
      </ul>
    </aside>
  );
}
