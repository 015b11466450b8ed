import { useEffect, useRef, type ReactNode } from 'react';

/**
 * The other methods, folded: a native disclosure (Enter or Space on its summary opens it), with the
 * notes on when the methods part above the tables that compare them. It opens before printing, so
 * the printed page carries every method.
 */
export function MethodsFold({ summary, notes, children }: { summary: string; notes: string[]; children: ReactNode }) {
  const ref = useRef<HTMLDetailsElement>(null);
  useEffect(() => {
    const open = () => ref.current?.setAttribute('open', '');
    window.addEventListener('beforeprint', open);
    return () => window.removeEventListener('beforeprint', open);
  }, []);
  return (
    <details ref={ref} className="card mt-6 px-4 py-3">
      <summary className="cursor-pointer font-semibold">{summary}</summary>
      <section aria-label="When the methods differ" className="mt-3 space-y-2 text-sm">
        {notes.map((n) => (
          <p key={n}>{n}</p>
        ))}
      </section>
      {children}
    </details>
  );
}
