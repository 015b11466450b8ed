import { In, IsNull, type DataSource, type EntityManager } from 'typeorm';
import { UserEntity, UserSiteEntity, type User } from '@ratewarden/db';
import { roleSchema } from '@ratewarden/shared/domain';
import type { Principal } from '@ratewarden/shared/permissions';

type UserPrincipal = Extract<Principal, { kind: 'user' }>;

const toPrincipal = (u: User, siteIds: number[]): UserPrincipal => ({
  kind: 'user',
  id: u.id,
  email: u.email,
  name: u.name,
  role: u.role === null ? null : roleSchema.parse(u.role),
  siteIds,
});

/** The sites each of `userIds` may see (site scoping), in id order; a person without sites has an empty list. */
export async function siteIdsByUser(db: DataSource | EntityManager, userIds: string[]): Promise<Map<string, number[]>> {
  const bySite = new Map(userIds.map((id): [string, number[]] => [id, []]));
  if (!userIds.length) return bySite;
  const links = await db.getRepository(UserSiteEntity).find({ where: { userId: In(userIds) }, order: { siteId: 'ASC' } });
  for (const l of links) bySite.get(l.userId)?.push(l.siteId);
  return bySite;
}

/** Loads a person with their role and sites, fresh on every request so changes apply at once. */
export async function loadUser(db: DataSource | EntityManager, id: string): Promise<UserPrincipal | undefined> {
  const user = await db.getRepository(UserEntity).findOneBy({ id });
  if (!user) return undefined;
  return toPrincipal(user, (await siteIdsByUser(db, [id])).get(id)!);
}

/**
 * Finds or creates the account for an identity-provider subject. A person pre-provisioned by
 * e-mail (subject still unknown) is bound on first sign-in; an unknown person gets an account
 * with no role, which an administrator must then grant.
 */
export async function accountForSignIn(
  ds: DataSource,
  identity: { subject: string; email: string; name: string },
): Promise<{ user: UserPrincipal; created: boolean }> {
  return ds.transaction(async (em) => {
    const users = em.getRepository(UserEntity);
    const email = identity.email.trim().toLowerCase();
    const signedIn = { name: identity.name, lastSignInAt: () => 'now()' };
    let id = (await users.findOne({ select: { id: true }, where: { subject: identity.subject } }))?.id;
    if (id) await users.update(id, { ...signedIn, email });
    if (!id) {
      // Pre-provisioned: bound now, unless another sign-in bound it a moment ago.
      const invited = await users.createQueryBuilder('u').select('u.id').where('u.subject IS NULL AND lower(u.email) = :email', { email }).getOne();
      if (invited && (await users.update({ id: invited.id, subject: IsNull() }, { ...signedIn, subject: identity.subject })).affected) id = invited.id;
    }
    let created = false;
    if (!id) {
      const inserted = await users.insert({ ...signedIn, subject: identity.subject, email });
      id = (inserted.identifiers[0] as { id: string }).id;
      created = true;
    }
    const user = await loadUser(em, id);
    return { user: user!, created };
  });
}
