import type { DataSource, EntityManager } from 'typeorm';
import { roleSchema, type Role } from '@ratewarden/shared/domain';
import type { Principal } from '@ratewarden/shared/permissions';
import { rows as sqlRows } from '@ratewarden/db';

type UserPrincipal = Extract<Principal, { kind: 'user' }>;

interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role | null;
  site_ids: number[];
}

const toPrincipal = (r: UserRow): UserPrincipal => ({
  kind: 'user',
  id: r.id,
  email: r.email,
  name: r.name,
  role: r.role === null ? null : roleSchema.parse(r.role),
  siteIds: r.site_ids.map(Number),
});

const SELECT_USER = `
  SELECT u.id, u.email, u.name, u.role,
         coalesce(array_agg(us.site_id ORDER BY us.site_id) FILTER (WHERE us.site_id IS NOT NULL), '{}') AS site_ids
    FROM users u LEFT JOIN user_sites us ON us.user_id = u.id`;

/** Loads a person with their role and sites, fresh on every request so changes apply at once. */
export async function loadUser(db: DataSource | EntityManager, id: string): Promise<UserPrincipal | undefined> {
  const rows: UserRow[] = await db.query(`${SELECT_USER} WHERE u.id = $1 GROUP BY u.id`, [id]);
  return rows[0] && toPrincipal(rows[0]);
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
    const email = identity.email.trim().toLowerCase();
    let rows = await sqlRows<{ id: string }>(
      em,
      `UPDATE users SET email = $2, name = $3, last_sign_in_at = now(), updated_at = now() WHERE subject = $1 RETURNING id`,
      [identity.subject, email, identity.name],
    );
    let created = false;
    if (!rows.length) {
      rows = await sqlRows<{ id: string }>(
        em,
        `UPDATE users SET subject = $1, name = $3, last_sign_in_at = now(), updated_at = now()
          WHERE subject IS NULL AND lower(email) = $2 RETURNING id`,
        [identity.subject, email, identity.name],
      );
    }
    if (!rows.length) {
      rows = await em.query(`INSERT INTO users (subject, email, name, last_sign_in_at) VALUES ($1, $2, $3, now()) RETURNING id`, [
        identity.subject,
        email,
        identity.name,
      ]);
      created = true;
    }
    const user = await loadUser(em, rows[0]!.id);
    return { user: user!, created };
  });
}
