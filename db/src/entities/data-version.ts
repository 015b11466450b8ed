import { EntitySchema } from 'typeorm';

/** One domain's counter, raised by every transaction that wrote what the domain's answers read (migration DataVersions). */
export interface DataVersion {
  domain: string;
  version: string;
}

export const DataVersionEntity = new EntitySchema<DataVersion>({
  name: 'DataVersion',
  tableName: 'data_versions',
  columns: {
    domain: { type: 'text', primary: true },
    version: { type: 'bigint', default: 0 },
  },
});
