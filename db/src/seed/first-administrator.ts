import type { DataSource } from 'typeorm';
import { SiteEntity } from '../entities/site';
import { UserEntity } from '../entities/user';
import { seedDemo } from './seed-demo';

/**
 * An empty start (`npm start -- --empty`): no demo data, only the first administrator, so that
 * someone can sign in and set the rest up (the first-run page says what). Pre-provisioned by
 * e-mail as the demo people are: the first sign-in with that address binds the account. Nothing
 * is written when the database already has sites or people. Returns whether it wrote.
 */
export async function seedFirstAdministrator(ds: DataSource, email: string, name = 'Administrator'): Promise<boolean> {
  return ds.transaction(async (em) => {
    const users = em.getRepository(UserEntity);
    if ((await em.getRepository(SiteEntity).exists()) || (await users.exists())) return false;
    await users.insert({ email, name, role: 'administrator' });
    return true;
  });
}

/**
 * What `npm start` writes into a new database: the demo scenario, or with `empty` the first
 * administrator only. A database that has people already (one started empty whose administrator
 * has not made a site yet) gets nothing on a later plain start. Returns what was written.
 */
export async function seedNewDatabase(ds: DataSource, options: { empty: boolean; firstAdminEmail: string }): Promise<'demo' | 'first administrator' | null> {
  if (options.empty) return (await seedFirstAdministrator(ds, options.firstAdminEmail)) ? 'first administrator' : null;
  return !(await ds.getRepository(UserEntity).exists()) && (await seedDemo(ds)) ? 'demo' : null;
}
