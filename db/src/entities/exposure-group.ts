import { EntitySchema } from 'typeorm';
import { timestampColumns, type Timestamps } from './base';

/** A similar exposure group: workers sharing a hazard at a comparable level. */
export interface ExposureGroup extends Timestamps {
  id: number;
  code: string;
  name: string;
  hazard: string;
  /** Ordinal exposure level used as the score in trend tests (0 = unexposed). */
  exposureLevel: number | null;
  /** The global reference group; an outcome may name its own instead. */
  isReference: boolean;
  description: string | null;
}

export const ExposureGroupEntity = new EntitySchema<ExposureGroup>({
  name: 'ExposureGroup',
  tableName: 'exposure_groups',
  columns: {
    id: { type: 'integer', primary: true, generated: 'increment' },
    code: { type: 'text', unique: true },
    name: { type: 'text' },
    hazard: { type: 'text' },
    exposureLevel: { name: 'exposure_level', type: 'integer', nullable: true },
    isReference: { name: 'is_reference', type: 'boolean', default: false },
    description: { type: 'text', nullable: true },
    ...timestampColumns,
  },
});
