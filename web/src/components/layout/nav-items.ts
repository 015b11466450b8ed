import type { Permission } from '@ratewarden/shared/permissions';
import { paths } from '../../config/paths';

/**
 * The main navigation. An item with a permission is hidden from roles that lack it, only to keep
 * the menu honest; the API checks every request itself.
 */
export interface NavItem {
  to: string;
  label: string;
  permission: Permission | null;
}

export const navItems: NavItem[] = [
  { to: paths.overview, label: 'Overview', permission: 'aggregates:read' },
  { to: paths.trends, label: 'Trends', permission: 'aggregates:read' },
  { to: paths.comparison, label: 'Group comparison', permission: 'aggregates:read' },
  { to: paths.adjusted, label: 'Adjusted view', permission: 'aggregates:read' },
  { to: paths.sir, label: 'Against reference rates', permission: 'aggregates:read' },
  { to: paths.flags, label: 'Flags', permission: 'flags:read' },
  { to: paths.notices, label: 'Notices', permission: 'flags:read' },
  { to: paths.cases, label: 'Case register', permission: 'cases:read' },
  { to: paths.rules, label: 'Watch rules', permission: 'rules:write' },
  { to: paths.intakes, label: 'Intakes', permission: 'intake:read' },
  { to: paths.audiogramUpload, label: 'Audiogram upload', permission: 'intake:write' },
  { to: paths.hearing, label: 'Audiograms', permission: 'cases:read' },
  { to: paths.periods, label: 'Reporting periods', permission: 'periods:read' },
  { to: paths.runs, label: 'Runs', permission: 'runs:read' },
  { to: paths.groups, label: 'Exposure groups', permission: 'groups:write' },
  { to: paths.outcomes, label: 'Outcomes', permission: 'groups:write' },
  { to: paths.adHoc, label: 'Ad hoc comparison', permission: null },
  { to: paths.settings, label: 'Analysis settings', permission: 'settings:read' },
  { to: paths.sites, label: 'Sites', permission: 'sites:manage' },
  { to: paths.admin, label: 'Administration', permission: 'users:manage' },
  { to: paths.mailbox, label: 'Mailbox', permission: 'mailbox:read' },
];
