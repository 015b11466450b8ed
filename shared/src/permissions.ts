import type { Role } from './domain';

/**
 * What each role may do: the one table the API enforces on every route and the web app reads to
 * hide what a role cannot use. Case-level data (`cases:*`) is the physician's alone.
 */
export const rolePermissions = {
  'aggregates:read': ['hygienist', 'safety_manager', 'physician'],
  'config:read': ['hygienist', 'safety_manager', 'physician', 'administrator'],
  'groups:write': ['hygienist'],
  'intake:formats': ['hygienist', 'safety_manager', 'physician', 'administrator'],
  // The physician reads intakes too: a roster check names the stored cases it would orphan (to them only).
  'intake:read': ['hygienist', 'physician'],
  'intake:write': ['hygienist'],
  // External reference rates (for the SIR): the hygienist's upload; read by every reader of aggregates.
  'reference:write': ['hygienist'],
  'runs:read': ['hygienist', 'safety_manager', 'physician'],
  'runs:trigger': ['hygienist'],
  'rules:read': ['hygienist', 'safety_manager', 'physician'],
  'rules:write': ['hygienist', 'safety_manager'],
  'flags:read': ['hygienist', 'safety_manager', 'physician'],
  'flags:review': ['safety_manager'],
  'periods:read': ['hygienist', 'safety_manager', 'physician'],
  'periods:close': ['hygienist'],
  'cases:read': ['physician'],
  // Counts of 1 to SMALL_CELL_THRESHOLD − 1 cases, shown to these roles and withheld from every other (app and notices).
  'counts:small': ['physician'],
  'cases:review': ['physician'],
  // Analysis settings (basis, multiplier, confidence, counted statuses, age bands): everyone reads
  // the version their figures were computed with; the administrator and the hygienist change them.
  'settings:read': ['hygienist', 'safety_manager', 'physician', 'administrator'],
  'settings:write': ['hygienist', 'administrator'],
  'sites:manage': ['administrator'],
  'users:manage': ['administrator'],
  'clients:manage': ['administrator'],
  'audit:read': ['administrator'],
  'mailbox:read': ['administrator'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof rolePermissions;

/** Integration clients (machines with a client-credentials token) may only push intakes. */
export const clientPermissions: readonly Permission[] = ['intake:write', 'intake:formats'];

/** The roles given a permission. */
export function rolesWith(permission: Permission): readonly Role[] {
  return rolePermissions[permission];
}

export function roleMay(role: Role | null | undefined, permission: Permission): boolean {
  return role != null && (rolePermissions[permission] as readonly Role[]).includes(role);
}

/** Who is making a request: a signed-in person or an integration client. */
export type Principal = { kind: 'user'; id: string; email: string; name: string; role: Role | null; siteIds: number[] } | { kind: 'client'; clientId: string };
