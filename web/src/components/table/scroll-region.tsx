import type { ReactNode } from 'react';

/**
 * The box a wide table scrolls in on a narrow screen: a named region that takes the keyboard's
 * focus, so a person without a pointer can scroll it with the arrow keys (WCAG 2.1.1).
 */
export function ScrollRegion({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div role="region" aria-label={label} tabIndex={0} className="mt-4 overflow-x-auto">
      {children}
    </div>
  );
}
