import { roleLabels } from '@ratewarden/shared/domain';
import { roleMay } from '@ratewarden/shared/permissions';
import { Suspense, useEffect, useState } from 'react';
import { NavLink, Outlet, useLocation } from 'react-router';
import { paths } from '../../config/paths';
import { useSession } from '../../api/get-session';
import { SignOutButton } from './sign-out-button';
import { PageLoading } from '../feedback/page-loading';
import { navItems } from './nav-items';
import { BrandMark } from './brand-mark';

/**
 * The frame every page sits in: a light top bar (mark, person, sign-out), the role-aware
 * navigation as a side rail on wide screens and behind a Menu button on narrow ones, the main
 * area, and the standing statement on what the figures are.
 */
export function PageFrame() {
  const session = useSession();
  const user = session.data?.user ?? null;
  const visible = navItems.filter((item) => item.permission === null || (user !== null && roleMay(user.role, item.permission)));
  const [menuOpen, setMenuOpen] = useState(false);
  const location = useLocation();
  useEffect(() => setMenuOpen(false), [location.pathname]);
  return (
    <div className="min-h-screen flex flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:z-10 focus:rounded-sm focus:bg-surface focus:p-2">
        Skip to content
      </a>
      <header className="no-print sticky top-0 z-[5] bg-surface shadow-[var(--shadow-card)]">
        <div className="mx-auto flex min-h-14 max-w-7xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-2">
          <NavLink to={paths.home} className="flex items-center gap-2 text-lg font-bold tracking-tight text-accent-strong">
            <BrandMark className="h-7 w-7" />
            Ratewarden
          </NavLink>
          {visible.length > 0 && (
            <button
              type="button"
              className="btn btn-quiet btn-small lg:hidden"
              aria-expanded={menuOpen}
              aria-controls="main-nav"
              onClick={() => setMenuOpen((o) => !o)}
            >
              {menuOpen ? 'Close the menu' : 'Menu'}
            </button>
          )}
          <div className="ml-auto flex flex-wrap items-center gap-3 text-sm">
            {user ? (
              <>
                <span>
                  <span className="font-semibold">{user.name}</span>
                  <span className="ml-2 rounded-full bg-accent-soft px-2 py-0.5 text-xs font-semibold text-accent-strong">
                    {user.role ? roleLabels[user.role] : 'no role yet'}
                  </span>
                </span>
                <SignOutButton />
              </>
            ) : (
              <a href={paths.signIn} className="btn btn-primary px-4 py-1.5">
                Sign in
              </a>
            )}
          </div>
        </div>
      </header>
      <div className="mx-auto flex w-full max-w-7xl flex-1 flex-col lg:flex-row lg:gap-6 lg:px-4">
        {visible.length > 0 && (
          <nav
            id="main-nav"
            aria-label="Main"
            className={`no-print ${menuOpen ? 'block' : 'hidden'} border-b border-line bg-surface px-4 py-3 lg:block lg:w-56 lg:shrink-0 lg:border-0 lg:bg-transparent lg:px-0 lg:py-6`}
          >
            <ul className="grid grid-cols-2 gap-1 text-sm sm:grid-cols-3 lg:grid-cols-1">
              {visible.map((item) => (
                <li key={item.to}>
                  <NavLink
                    to={item.to}
                    className={({ isActive }) =>
                      `flex items-center gap-2 rounded-sm px-3 py-2 ${isActive ? 'bg-accent-soft font-semibold text-accent-strong' : 'text-ink hover:bg-surface'}`
                    }
                  >
                    {({ isActive }) => (
                      <>
                        <span aria-hidden="true" className={`h-1.5 w-1.5 rounded-full ${isActive ? 'bg-accent' : 'bg-line'}`} />
                        {item.label}
                      </>
                    )}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
        )}
        <div className="flex min-w-0 flex-1 flex-col">
          <main id="main" className="w-full min-w-0 flex-1 px-4 py-6 lg:px-0 lg:py-8">
            <Suspense fallback={<PageLoading />}>
              <Outlet />
            </Suspense>
          </main>
          <footer className="flex items-start gap-2 border-t border-line px-4 py-4 text-xs text-ink-soft lg:px-0">
            <BrandMark className="mt-0.5 h-4 w-4 shrink-0" />
            <p>
              Surveillance figures show associations, not causes. Flags are prompts for review by qualified people; medical decisions belong to a licensed
              occupational physician under local regulations.
            </p>
          </footer>
        </div>
      </div>
    </div>
  );
}
