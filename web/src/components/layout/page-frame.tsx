import { NavLink, Outlet } from 'react-router';
import { paths } from '../../config/paths';

/** The frame every page sits in: masthead, navigation, main area, the standing caution. */
export function PageFrame() {
  return (
    <div className="min-h-screen flex flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:p-2 focus:bg-panel">
        Skip to content
      </a>
      <header className="no-print bg-ink text-paper">
        <div className="mx-auto max-w-6xl px-4 h-14 flex items-center gap-6">
          <NavLink to={paths.home} className="flex items-center gap-2 font-semibold tracking-wide text-lg">
            <svg aria-hidden="true" viewBox="0 0 32 32" className="h-6 w-6">
              <path d="M5 24 L12 15 L18 19 L27 8" stroke="#e0a23a" strokeWidth="3.5" fill="none" strokeLinecap="square" />
            </svg>
            Ratewarden
          </NavLink>
          <nav aria-label="Main" className="flex-1" />
          <a href={paths.signIn} className="rounded-sm border border-paper/40 px-3 py-1 text-sm hover:bg-paper hover:text-ink">
            Sign in
          </a>
        </div>
      </header>
      <main id="main" className="flex-1 mx-auto w-full max-w-6xl px-4 py-8">
        <Outlet />
      </main>
      <footer className="border-t border-rule text-xs text-ink-soft">
        <p className="mx-auto max-w-6xl px-4 py-3">
          Surveillance figures show associations, not causes. Flags are prompts for review by qualified people; medical
          decisions belong to a licensed occupational physician under local regulations.
        </p>
      </footer>
    </div>
  );
}
