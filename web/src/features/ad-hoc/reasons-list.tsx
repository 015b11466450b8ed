import type { Reason } from '@ratewarden/shared/stats';

/** Why some figures read "not defined": the core's own words, per field. */
export function ReasonsList({ reasons }: { reasons: Reason[] }) {
  if (reasons.length === 0) return null;
  return (
    <section aria-label="Figures that are not defined" className="note note-watch mt-4 px-4 py-3 text-sm">
      <h3 className="font-semibold">Not every figure can be computed from these counts</h3>
      <ul className="mt-1 list-disc pl-5">
        {reasons.map((r) => (
          <li key={`${r.field}:${r.reason}`}>
            <code className="font-mono text-xs">{r.field}</code>: {r.reason}
          </li>
        ))}
      </ul>
    </section>
  );
}
