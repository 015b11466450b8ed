import { EntitySchema } from 'typeorm';
import type { AudiogramTestType, Ear } from '@ratewarden/shared/hearing/audiogram';

/** One ear of one audiometric test, thresholds in dB HL. Case-level: physician only. */
export interface Audiogram {
  id: string;
  intakeId: string;
  workerId: string;
  testDate: string;
  ear: Ear;
  testType: AudiogramTestType;
  hl500: number;
  hl1000: number;
  hl2000: number;
  hl3000: number;
  hl4000: number;
  hl6000: number;
  hl8000: number | null;
  createdAt: Date;
}

const level = (name: string, nullable = false) => ({ name, type: 'integer' as const, nullable });

export const AudiogramEntity = new EntitySchema<Audiogram>({
  name: 'Audiogram',
  tableName: 'audiograms',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    intakeId: { name: 'intake_id', type: 'uuid' },
    workerId: { name: 'worker_id', type: 'bigint' },
    testDate: { name: 'test_date', type: 'date' },
    ear: { type: 'text' },
    testType: { name: 'test_type', type: 'text' },
    hl500: level('hl_500'),
    hl1000: level('hl_1000'),
    hl2000: level('hl_2000'),
    hl3000: level('hl_3000'),
    hl4000: level('hl_4000'),
    hl6000: level('hl_6000'),
    hl8000: level('hl_8000', true),
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  uniques: [{ name: 'audiograms_worker_id_test_date_ear_test_type_key', columns: ['workerId', 'testDate', 'ear', 'testType'] }],
  checks: [
    { name: 'audiograms_ear_check', expression: "(ear = ANY (ARRAY['left'::text, 'right'::text]))" },
    { name: 'audiograms_hl_1000_check', expression: "(((hl_1000 >= '-10'::integer) AND (hl_1000 <= 120)) AND ((hl_1000 % 5) = 0))" },
    { name: 'audiograms_hl_2000_check', expression: "(((hl_2000 >= '-10'::integer) AND (hl_2000 <= 120)) AND ((hl_2000 % 5) = 0))" },
    { name: 'audiograms_hl_3000_check', expression: "(((hl_3000 >= '-10'::integer) AND (hl_3000 <= 120)) AND ((hl_3000 % 5) = 0))" },
    { name: 'audiograms_hl_4000_check', expression: "(((hl_4000 >= '-10'::integer) AND (hl_4000 <= 120)) AND ((hl_4000 % 5) = 0))" },
    { name: 'audiograms_hl_500_check', expression: "(((hl_500 >= '-10'::integer) AND (hl_500 <= 120)) AND ((hl_500 % 5) = 0))" },
    { name: 'audiograms_hl_6000_check', expression: "(((hl_6000 >= '-10'::integer) AND (hl_6000 <= 120)) AND ((hl_6000 % 5) = 0))" },
    { name: 'audiograms_hl_8000_check', expression: "(((hl_8000 >= '-10'::integer) AND (hl_8000 <= 120)) AND ((hl_8000 % 5) = 0))" },
    { name: 'audiograms_test_type_check', expression: "(test_type = ANY (ARRAY['baseline'::text, 'annual'::text, 'retest'::text]))" },
  ],
  foreignKeys: [
    { name: 'audiograms_intake_id_fkey', target: 'Intake', columnNames: ['intake_id'], referencedColumnNames: ['id'] },
    { name: 'audiograms_worker_id_fkey', target: 'Worker', columnNames: ['worker_id'], referencedColumnNames: ['id'] },
  ],
});
