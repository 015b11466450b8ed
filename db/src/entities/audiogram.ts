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
});
