/** Ratewarden's mark: a rate stepping up inside a rounded tile, the last step watched by a ring. */
export function BrandMark({ className }: { className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 32 32" className={className}>
      <rect x="1" y="1" width="30" height="30" rx="8" fill="var(--color-accent)" />
      <path d="M6 23 H12 V17 H18 V12 H21" stroke="#fff" strokeWidth="2.6" fill="none" strokeLinejoin="round" strokeLinecap="round" />
      <circle cx="24.5" cy="10" r="3.2" stroke="#fff" strokeWidth="2.2" fill="none" />
    </svg>
  );
}
