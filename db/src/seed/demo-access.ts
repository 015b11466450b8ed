import type { EntityManager } from 'typeorm';
import type { Role } from '@ratewarden/shared/domain';

/**
 * The demo people, pre-provisioned by e-mail (their first sign-in binds the account), with sites
 * chosen so that scoping shows: the safety manager sees the two northern sites only.
 */
export const demoPeople: ReadonlyArray<{ email: string; name: string; role: Role; sites: 'all' | string[] }> = [
  { email: 'hygienist@demo.ratewarden.test', name: 'Ines Varga', role: 'hygienist', sites: 'all' },
  { email: 'safety@demo.ratewarden.test', name: 'Tomas Okafor', role: 'safety_manager', sites: ['NFD', 'RVW'] },
  { email: 'physician@demo.ratewarden.test', name: 'Dr Mirela Santos', role: 'physician', sites: 'all' },
  { email: 'admin@demo.ratewarden.test', name: 'Pavel Lindqvist', role: 'administrator', sites: [] },
];

export const demoIntegrationClient = { clientId: 'hr-sync-demo', name: 'HR roster sync (demo)' };

export async function seedDemoAccess(em: EntityManager): Promise<void> {
  for (const p of demoPeople) {
    const [user] = (await em.query(`INSERT INTO users (email, name, role) VALUES ($1, $2, $3) RETURNING id`, [p.email, p.name, p.role])) as { id: string }[];
    await em.query(`INSERT INTO user_sites (user_id, site_id) SELECT $1, id FROM sites WHERE $2::text[] IS NULL OR code = ANY($2::text[])`, [
      user!.id,
      p.sites === 'all' ? null : p.sites,
    ]);
  }
  await em.query(`INSERT INTO integration_clients (client_id, name) VALUES ($1, $2)`, [demoIntegrationClient.clientId, demoIntegrationClient.name]);
}
