/** Every URL the web app links to, built in one place. */
export const paths = {
  home: '/',
  signIn: '/auth/login',
  signOut: '/auth/logout',
  noRole: '/no-role',
  overview: '/overview',
  trends: '/trends',
  comparison: '/comparison',
  adjusted: '/adjusted',
  flags: '/flags',
  flag: (id: string | number) => `/flags/${id}`,
  intakes: '/intakes',
  intake: (id: string | number) => `/intakes/${id}`,
  runs: '/runs',
  unattributed: '/runs/unattributed',
  periods: '/periods',
  rules: '/rules',
  ruleNew: '/rules/new',
  rule: (id: string) => `/rules/${id}`,
  groups: '/groups',
  outcomes: '/outcomes',
  adHoc: '/ad-hoc',
  settings: '/settings',
  sites: '/sites',
  firstRun: '/first-run',
  admin: '/admin',
  adminClients: '/admin/clients',
  adminAudit: '/admin/audit',
  mailbox: '/mailbox',
} as const;

/** API endpoints, relative to the app's own origin. */
export const apiPaths = {
  session: '/api/session',
} as const;
