import { In, type DataSource, type EntityManager } from 'typeorm';
import { IntegrationClientEntity, SiteEntity, UserEntity, UserSiteEntity, type IntegrationClient, type User } from '@ratewarden/db';
import type { AdminUser, AuditEventView, AuditQuery, ClientRegistration, IntegrationClientView, UserAccessUpdate, UserInvite } from '@ratewarden/shared/admin';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { siteIdsByUser } from '../../auth/user-accounts';
import { AppError } from '../../lib/app-error';
import { changedFields } from '../../lib/changed-fields';
import { auditPage } from './audit-query';

/** A person as the administrator's list shows them. */
const toAdminUser = (u: User, siteIds: number[]): AdminUser => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: u.role,
  siteIds,
  signedUp: u.subject !== null,
  lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
});

/** Every person: those without a role first (they wait for one), then by role and e-mail. */
export async function listUsers(ds: DataSource): Promise<AdminUser[]> {
  const users = await ds.getRepository(UserEntity).find({ order: { role: { direction: 'ASC', nulls: 'FIRST' }, email: 'ASC' } });
  const sites = await siteIdsByUser(
    ds,
    users.map((u) => u.id),
  );
  return users.map((u) => toAdminUser(u, sites.get(u.id)!));
}

async function adminUser(em: EntityManager, id: string, lock = false): Promise<AdminUser | undefined> {
  const user = await em.getRepository(UserEntity).findOne({ where: { id }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
  if (!user) return undefined;
  return toAdminUser(user, (await siteIdsByUser(em, [id])).get(id)!);
}

async function assertSitesExist(em: EntityManager, siteIds: number[]): Promise<void> {
  if (!siteIds.length) return;
  const found = await em.getRepository(SiteEntity).find({ select: { id: true }, where: { id: In(siteIds) } });
  const missing = siteIds.filter((id) => !found.some((s) => s.id === id));
  if (missing.length) throw new AppError('validation_failed', `unknown site ids: ${missing.join(', ')}`);
}

async function setSites(em: EntityManager, userId: string, siteIds: number[]): Promise<void> {
  const links = em.getRepository(UserSiteEntity);
  await links.delete({ userId });
  if (siteIds.length) await links.insert(siteIds.map((siteId) => ({ userId, siteId })));
}

/**
 * Sets a person's role and sites in one transaction, audited with the before and after. The same
 * role and sites again change nothing: nothing is written or audited, and the person comes back as they are.
 */
export async function updateUserAccess(ds: DataSource, actor: Principal, userId: string, requested: UserAccessUpdate, ip?: string): Promise<AdminUser> {
  const update = { role: requested.role, siteIds: [...new Set(requested.siteIds)].sort((a, b) => a - b) };
  return ds.transaction(async (em) => {
    const stored = await adminUser(em, userId, true);
    if (!stored) throw new AppError('not_found', 'no such person');
    if (changedFields(stored, update).length === 0) return stored;
    if (actor.kind === 'user' && actor.id === userId && update.role !== 'administrator') {
      throw new AppError('conflict', 'you cannot remove your own administrator role; ask another administrator');
    }
    await assertSitesExist(em, update.siteIds);
    await em.getRepository(UserEntity).update(userId, { role: update.role });
    await setSites(em, userId, update.siteIds);
    await recordAudit(em, {
      actor,
      action: 'user.access_changed',
      target: `user:${userId}`,
      ip,
      detail: { email: stored.email, before: { role: stored.role, siteIds: stored.siteIds }, after: { role: update.role, siteIds: update.siteIds } },
    });
    return (await adminUser(em, userId))!;
  });
}

/** Provisions a person by e-mail; their first sign-in binds the account. */
export async function inviteUser(ds: DataSource, actor: Principal, invite: UserInvite, ip?: string): Promise<AdminUser> {
  return ds.transaction(async (em) => {
    const users = em.getRepository(UserEntity);
    if (await users.createQueryBuilder('u').where('lower(u.email) = :email', { email: invite.email }).getExists())
      throw new AppError('conflict', `${invite.email} already has an account`);
    await assertSitesExist(em, invite.siteIds);
    const { id } = await users.save({ email: invite.email, name: invite.name, role: invite.role });
    await setSites(em, id, invite.siteIds);
    await recordAudit(em, {
      actor,
      action: 'user.provisioned',
      target: `user:${id}`,
      ip,
      detail: { email: invite.email, role: invite.role, siteIds: invite.siteIds },
    });
    return (await adminUser(em, id))!;
  });
}

/** An integration client as the administrator's list shows it. */
const toClient = (c: IntegrationClient): IntegrationClientView => ({
  clientId: c.clientId,
  name: c.name,
  registeredAt: c.registeredAt.toISOString(),
  revokedAt: c.revokedAt?.toISOString() ?? null,
});

export async function listClients(ds: DataSource): Promise<IntegrationClientView[]> {
  return (await ds.getRepository(IntegrationClientEntity).find({ order: { registeredAt: 'ASC' } })).map(toClient);
}

export async function registerClient(ds: DataSource, actor: Principal, reg: ClientRegistration, ip?: string): Promise<IntegrationClientView> {
  return ds.transaction(async (em) => {
    const clients = em.getRepository(IntegrationClientEntity);
    await clients.insert({ clientId: reg.clientId, name: reg.name, registeredBy: actor.kind === 'user' ? actor.id : null }).catch((e: unknown) => {
      if ((e as { code?: string }).code === '23505') throw new AppError('conflict', `client ${reg.clientId} is already registered`);
      throw e;
    });
    await recordAudit(em, { actor, action: 'client.registered', target: `client:${reg.clientId}`, ip, detail: { name: reg.name } });
    return toClient(await clients.findOneByOrFail({ clientId: reg.clientId }));
  });
}

/** Revokes a client; revoking it again keeps the first revocation's time and person. */
export async function revokeClient(ds: DataSource, actor: Principal, clientId: string, ip?: string): Promise<IntegrationClientView> {
  return ds.transaction(async (em) => {
    const clients = em.getRepository(IntegrationClientEntity);
    const client = await clients.findOne({ where: { clientId }, lock: { mode: 'pessimistic_write' } });
    if (!client) throw new AppError('not_found', `no client ${clientId}`);
    const actorId = actor.kind === 'user' ? actor.id : null;
    if (client.revokedAt === null || client.revokedBy === null)
      await clients.update(clientId, { revokedAt: client.revokedAt ?? (() => 'now()'), revokedBy: client.revokedBy ?? actorId });
    await recordAudit(em, { actor, action: 'client.revoked', target: `client:${clientId}`, ip });
    return toClient(await clients.findOneByOrFail({ clientId }));
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
  const rows = await auditPage(ds, q);
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
