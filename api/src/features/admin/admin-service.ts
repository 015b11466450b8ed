import type { DataSource } from 'typeorm';
import type { AdminUser, AuditEventView, AuditQuery, ClientRegistration, IntegrationClientView, UserAccessUpdate, UserInvite } from '@ratewarden/shared/admin';
import type { Principal } from '@ratewarden/shared/permissions';
import { rows as sqlRows } from '@ratewarden/db';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import { changedFields } from '../../lib/changed-fields';

const USERS_SQL = `
  SELECT u.id, u.email, u.name, u.role, u.subject IS NOT NULL AS signed_up, u.last_sign_in_at,
         coalesce(array_agg(us.site_id ORDER BY us.site_id) FILTER (WHERE us.site_id IS NOT NULL), '{}') AS site_ids
    FROM users u LEFT JOIN user_sites us ON us.user_id = u.id`;

interface UserRow {
  id: string;
  email: string;
  name: string;
  role: AdminUser['role'];
  signed_up: boolean;
  last_sign_in_at: Date | null;
  site_ids: number[];
}
const toAdminUser = (r: UserRow): AdminUser => ({
  id: r.id,
  email: r.email,
  name: r.name,
  role: r.role,
  siteIds: r.site_ids.map(Number),
  signedUp: r.signed_up,
  lastSignInAt: r.last_sign_in_at?.toISOString() ?? null,
});

export async function listUsers(ds: DataSource): Promise<AdminUser[]> {
  const rows: UserRow[] = await ds.query(`${USERS_SQL} GROUP BY u.id ORDER BY u.role NULLS FIRST, u.email`);
  return rows.map(toAdminUser);
}

async function assertSitesExist(ds: DataSource | import('typeorm').EntityManager, siteIds: number[]): Promise<void> {
  if (!siteIds.length) return;
  const rows: { id: number }[] = await ds.query(`SELECT id FROM sites WHERE id = ANY($1)`, [siteIds]);
  const missing = siteIds.filter((id) => !rows.some((r) => r.id === id));
  if (missing.length) throw new AppError('validation_failed', `unknown site ids: ${missing.join(', ')}`);
}

/**
 * Sets a person's role and sites in one transaction, audited with the before and after. The same
 * role and sites again change nothing: nothing is written or audited, and the person comes back as they are.
 */
export async function updateUserAccess(ds: DataSource, actor: Principal, userId: string, requested: UserAccessUpdate, ip?: string): Promise<AdminUser> {
  const update = { role: requested.role, siteIds: [...new Set(requested.siteIds)].sort((a, b) => a - b) };
  return ds.transaction(async (em) => {
    // PostgreSQL refuses FOR UPDATE beside GROUP BY: lock the person's row first, then read it.
    await em.query(`SELECT 1 FROM users WHERE id = $1 FOR UPDATE`, [userId]);
    const before: UserRow[] = await em.query(`${USERS_SQL} WHERE u.id = $1 GROUP BY u.id`, [userId]);
    if (!before[0]) throw new AppError('not_found', 'no such person');
    const stored = toAdminUser(before[0]);
    if (changedFields(stored, update).length === 0) return stored;
    if (actor.kind === 'user' && actor.id === userId && update.role !== 'administrator') {
      throw new AppError('conflict', 'you cannot remove your own administrator role; ask another administrator');
    }
    await assertSitesExist(em, update.siteIds);
    await em.query(`UPDATE users SET role = $2, updated_at = now() WHERE id = $1`, [userId, update.role]);
    await em.query(`DELETE FROM user_sites WHERE user_id = $1`, [userId]);
    if (update.siteIds.length) {
      await em.query(`INSERT INTO user_sites (user_id, site_id) SELECT $1, unnest($2::int[])`, [userId, update.siteIds]);
    }
    const after: UserRow[] = await em.query(`${USERS_SQL} WHERE u.id = $1 GROUP BY u.id`, [userId]);
    await recordAudit(em, {
      actor,
      action: 'user.access_changed',
      target: `user:${userId}`,
      ip,
      detail: { email: before[0].email, before: { role: before[0].role, siteIds: before[0].site_ids }, after: { role: update.role, siteIds: update.siteIds } },
    });
    return toAdminUser(after[0]!);
  });
}

/** Provisions a person by e-mail; their first sign-in binds the account. */
export async function inviteUser(ds: DataSource, actor: Principal, invite: UserInvite, ip?: string): Promise<AdminUser> {
  return ds.transaction(async (em) => {
    const exists: unknown[] = await em.query(`SELECT 1 FROM users WHERE lower(email) = $1`, [invite.email]);
    if (exists.length) throw new AppError('conflict', `${invite.email} already has an account`);
    await assertSitesExist(em, invite.siteIds);
    const [row] = (await em.query(`INSERT INTO users (email, name, role) VALUES ($1, $2, $3) RETURNING id`, [invite.email, invite.name, invite.role])) as {
      id: string;
    }[];
    if (invite.siteIds.length) await em.query(`INSERT INTO user_sites (user_id, site_id) SELECT $1, unnest($2::int[])`, [row!.id, invite.siteIds]);
    await recordAudit(em, {
      actor,
      action: 'user.provisioned',
      target: `user:${row!.id}`,
      ip,
      detail: { email: invite.email, role: invite.role, siteIds: invite.siteIds },
    });
    const [after] = (await em.query(`${USERS_SQL} WHERE u.id = $1 GROUP BY u.id`, [row!.id])) as UserRow[];
    return toAdminUser(after!);
  });
}

interface ClientRow {
  client_id: string;
  name: string;
  registered_at: Date;
  revoked_at: Date | null;
}
const toClient = (r: ClientRow): IntegrationClientView => ({
  clientId: r.client_id,
  name: r.name,
  registeredAt: r.registered_at.toISOString(),
  revokedAt: r.revoked_at?.toISOString() ?? null,
});

export async function listClients(ds: DataSource): Promise<IntegrationClientView[]> {
  const rows: ClientRow[] = await ds.query(`SELECT client_id, name, registered_at, revoked_at FROM integration_clients ORDER BY registered_at`);
  return rows.map(toClient);
}

export async function registerClient(ds: DataSource, actor: Principal, reg: ClientRegistration, ip?: string): Promise<IntegrationClientView> {
  return ds.transaction(async (em) => {
    const actorId = actor.kind === 'user' ? actor.id : null;
    const rows: ClientRow[] = await em.query(
      `INSERT INTO integration_clients (client_id, name, registered_by) VALUES ($1, $2, $3)
       ON CONFLICT (client_id) DO NOTHING RETURNING client_id, name, registered_at, revoked_at`,
      [reg.clientId, reg.name, actorId],
    );
    if (!rows[0]) throw new AppError('conflict', `client ${reg.clientId} is already registered`);
    await recordAudit(em, { actor, action: 'client.registered', target: `client:${reg.clientId}`, ip, detail: { name: reg.name } });
    return toClient(rows[0]);
  });
}

export async function revokeClient(ds: DataSource, actor: Principal, clientId: string, ip?: string): Promise<IntegrationClientView> {
  return ds.transaction(async (em) => {
    const actorId = actor.kind === 'user' ? actor.id : null;
    const rows = await sqlRows<ClientRow>(
      em,
      `UPDATE integration_clients SET revoked_at = coalesce(revoked_at, now()), revoked_by = coalesce(revoked_by, $2)
        WHERE client_id = $1 RETURNING client_id, name, registered_at, revoked_at`,
      [clientId, actorId],
    );
    if (!rows[0]) throw new AppError('not_found', `no client ${clientId}`);
    await recordAudit(em, { actor, action: 'client.revoked', target: `client:${clientId}`, ip });
    return toClient(rows[0]);
  });
}

/** Detail keys of entries written before audit entries stopped carrying counts and measure values (the log is append-only). */
const FIGURE_KEYS = new Set(['count', 'value', 'cases', 'previous', 'previousWorst', 'expected']);

/** An entry's detail without counts or measure values: the administrator reads the log and may not read aggregates. */
function withoutFigures(detail: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(detail ?? {}).filter(([k]) => !FIGURE_KEYS.has(k)));
}

/** The audit log, newest first, filtered; read-only by construction (the table refuses changes). */
export async function queryAudit(ds: DataSource, q: AuditQuery): Promise<AuditEventView[]> {
  const where: string[] = [];
  const args: unknown[] = [];
  const add = (sql: string, value: unknown) => {
    args.push(value);
    where.push(sql.replace('?', `$${args.length}`));
  };
  if (q.action) add(`a.action LIKE ? || '%'`, q.action);
  if (q.actor) add(`(a.actor_label ILIKE '%' || ? || '%' OR au.name ILIKE '%' || $${args.length + 1} || '%')`, q.actor);
  if (q.from) add(`a.at >= ?::timestamptz`, q.from);
  if (q.to) add(`a.at < ?::timestamptz`, q.to);
  if (q.before) add(`a.id < ?`, q.before);
  args.push(q.limit);
  // The page first, then each entry's actor and target named from their tables as they are now.
  const rows: {
    id: string;
    at: Date;
    actor_label: string;
    actor_name: string | null;
    action: string;
    target: string | null;
    target_name: string | null;
    detail: Record<string, unknown>;
    ip: string | null;
  }[] = await ds.query(
    `WITH page AS (
         SELECT a.id, a.at, a.actor_label, au.name AS actor_name, a.action, a.target, a.detail, a.ip,
                split_part(a.target, ':', 1) AS kind, substr(a.target, length(split_part(a.target, ':', 1)) + 2) AS ref
           FROM audit_events a LEFT JOIN users au ON au.id = a.actor_id
           ${where.length ? `WHERE ${where.join(' AND ')}` : ''}
          ORDER BY a.id DESC LIMIT $${args.length})
       SELECT p.id, p.at, p.actor_label, p.actor_name, p.action, p.target, p.detail, p.ip,
              CASE p.kind
                WHEN 'user' THEN tu.name
                WHEN 'exposure_group' THEN tg.name
                WHEN 'outcome' THEN tout.name
                WHEN 'watch_rule' THEN tr.name
                WHEN 'intake' THEN ti.file_name
                WHEN 'client' THEN tc.name
                WHEN 'run' THEN 'run ' || trun.number
                WHEN 'flag' THEN fg.name || ', ' || fo.name
              END AS target_name
         FROM page p
         LEFT JOIN users tu ON p.kind = 'user' AND tu.id::text = p.ref
         LEFT JOIN exposure_groups tg ON p.kind = 'exposure_group' AND tg.id::text = p.ref
         LEFT JOIN outcomes tout ON p.kind = 'outcome' AND tout.id::text = p.ref
         LEFT JOIN watch_rules tr ON p.kind = 'watch_rule' AND tr.id::text = p.ref
         LEFT JOIN intakes ti ON p.kind = 'intake' AND ti.id::text = p.ref
         LEFT JOIN integration_clients tc ON p.kind = 'client' AND tc.client_id = p.ref
         LEFT JOIN runs trun ON p.kind = 'run' AND trun.id::text = p.ref
         LEFT JOIN flags tf ON p.kind = 'flag' AND tf.id::text = p.ref
         LEFT JOIN exposure_groups fg ON fg.id = tf.exposure_group_id
         LEFT JOIN outcomes fo ON fo.id = tf.outcome_id
        ORDER BY p.id DESC`,
    args,
  );
  return rows.map((r) => ({
    id: Number(r.id),
    at: r.at.toISOString(),
    actor: r.actor_label,
    actorName: r.actor_name,
    action: r.action,
    target: r.target,
    targetName: r.target_name,
    detail: withoutFigures(r.detail),
    ip: r.ip,
  }));
}
