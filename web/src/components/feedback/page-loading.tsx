/** What a page shows while its data or its code is on the way. */
export function PageLoading({ label = 'Loading' }: { label?: string }) {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 py-10 text-ink-soft">
      <span aria-hidden="true" className="h-4 w-4 animate-spin border-2 border-line border-t-accent" />
      <span>{label} …</span>
    </div>
  );
}
