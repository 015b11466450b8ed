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
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'exposure_groups_code_check', expression: "(code ~ '^[A-Za-z0-9_-]{1,32}$'::text)" },
    { name: 'exposure_groups_exposure_level_check', expression: '(exposure_level >= 0)' },
  ],
  indices: [{ name: 'exposure_groups_one_reference', columns: [], unique: true, where: 'is_reference', synchronize: false }],
});
