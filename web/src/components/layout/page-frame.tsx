import { roleLabels } from '@ratewarden/shared/domain';
import { roleMay } from '@ratewarden/shared/permissions';
import { Suspense } from 'react';
import { NavLink, Outlet } from 'react-router';
import { paths } from '../../config/paths';
import { useSession } from '../../api/get-session';
import { SignOutButton } from './sign-out-button';
import { PageLoading } from '../feedback/page-loading';
import { navItems } from './nav-items';

/** The frame every page sits in: masthead, role-aware navigation, main area, the standing caution. */
export function PageFrame() {
  const session = useSession();
  const user = session.data?.user ?? null;
  const visible = navItems.filter((item) => item.permission === null || (user !== null && roleMay(user.role, item.permission)));
  return (
    <div className="min-h-screen flex flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:p-2 focus:bg-panel">
        Skip to content
      </a>
      <header className="no-print bg-ink text-paper">
        <div className="mx-auto max-w-6xl px-4 min-h-14 flex flex-wrap items-center gap-x-6 gap-y-2 py-2">
          <NavLink to={paths.home} className="flex items-center gap-2 font-semibold tracking-wide text-lg">
            <svg aria-hidden="true" viewBox="0 0 32 32" className="h-6 w-6">
              <path d="M5 24 L12 15 L18 19 L27 8" stroke="#e0a23a" strokeWidth="3.5" fill="none" strokeLinecap="square" />
            </svg>
            Ratewarden
          </NavLink>
          <div className="ml-auto flex items-center gap-3 text-sm">
            {user ? (
              <>
                <span>
                  <span className="font-medium">{user.name}</span>
                  <span className="text-paper/70"> · {user.role ? roleLabels[user.role] : 'no role yet'}</span>
                </span>
                <SignOutButton />
              </>
            ) : (
              <a href={paths.signIn} className="rounded-sm border border-paper/40 px-3 py-1 hover:bg-paper hover:text-ink">
                Sign in
              </a>
            )}
          </div>
        </div>
        <nav aria-label="Main" className="border-t border-paper/15">
          <ul className="mx-auto max-w-6xl px-4 flex flex-wrap gap-x-1 text-sm">
            {visible.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  className={({ isActive }) =>
                    `block border-b-3 px-2.5 py-2 ${isActive ? 'border-amber font-semibold' : 'border-transparent text-paper/85 hover:text-paper hover:border-paper/40'}`
                  }
                >
                  {item.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main id="main" className="flex-1 mx-auto w-full max-w-6xl px-4 py-8">
        <Suspense fallback={<PageLoading />}>
          <Outlet />
        </Suspense>
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
