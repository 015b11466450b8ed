import type { EntitySchemaColumnOptions } from 'typeorm';

/** Columns every configuration table carries. */
export interface Timestamps {
  createdAt: Date;
  updatedAt: Date;
}

export const timestampColumns: Record<keyof Timestamps, EntitySchemaColumnOptions> = {
  createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
  updatedAt: { name: 'updated_at', type: 'timestamptz', updateDate: true },
};
