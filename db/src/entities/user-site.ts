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
});
