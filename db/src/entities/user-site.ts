import { EntitySchema } from 'typeorm';

/** Which sites a person may see (site scoping). */
export interface UserSite {
  userId: string;
  siteId: number;
}

export const UserSiteEntity = new EntitySchema<UserSite>({
  name: 'UserSite',
  tableName: 'user_sites',
  columns: {
    userId: { name: 'user_id', type: 'uuid', primary: true },
    siteId: { name: 'site_id', type: 'integer', primary: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  foreignKeys: [
    { name: 'user_sites_site_id_fkey', target: 'Site', columnNames: ['site_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
    { name: 'user_sites_user_id_fkey', target: 'User', columnNames: ['user_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
  ],
});
