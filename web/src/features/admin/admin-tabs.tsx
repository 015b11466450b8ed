import { NavLink } from 'react-router';
import { paths } from '../../config/paths';

/** The administrator's three pages, as one small sub-navigation. */
export function AdminTabs() {
  const tabs = [
    { to: paths.admin, label: 'People', end: true },
    { to: paths.adminClients, label: 'Integration clients', end: false },
    { to: paths.adminAudit, label: 'Audit log', end: false },
  ];
  return (
    <nav aria-label="Administration" className="no-print mt-4 flex gap-1 border-b border-line">
      {tabs.map((t) => (
        <NavLink
          key={t.to}
          to={t.to}
          end={t.end}
          className={({ isActive }) => `border-b-3 px-3 py-2 text-sm ${isActive ? 'border-ink font-semibold' : 'border-transparent hover:border-line'}`}
        >
          {t.label}
        </NavLink>
      ))}
    </nav>
  );
}
