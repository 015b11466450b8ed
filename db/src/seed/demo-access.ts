import { In, type EntityManager } from 'typeorm';
import { IntegrationClientEntity } from '../entities/integration-client';
import { SiteEntity } from '../entities/site';
import { UserEntity } from '../entities/user';
import { UserSiteEntity } from '../entities/user-site';
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
    const { id: userId } = await em.getRepository(UserEntity).save({ email: p.email, name: p.name, role: p.role });
    const sites = await em.getRepository(SiteEntity).find({ select: { id: true }, where: p.sites === 'all' ? {} : { code: In(p.sites) } });
    if (sites.length) await em.getRepository(UserSiteEntity).insert(sites.map((s) => ({ userId, siteId: s.id })));
  }
  await em.getRepository(IntegrationClientEntity).insert(demoIntegrationClient);
}
