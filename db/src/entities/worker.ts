import { EntitySchema } from 'typeorm';

/** A pseudonymous worker: the HR key, and only what strata need (no names). */
export interface Worker {
  id: string;
  workerKey: string;
  birthYear: number | null;
  sex: 'F' | 'M' | 'X' | null;
  firstIntakeId: string | null;
  createdAt: Date;
}

export const WorkerEntity = new EntitySchema<Worker>({
  name: 'Worker',
  tableName: 'workers',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    workerKey: { name: 'worker_key', type: 'text', unique: true },
    birthYear: { name: 'birth_year', type: 'integer', nullable: true },
    sex: { type: 'text', nullable: true },
    firstIntakeId: { name: 'first_intake_id', type: 'uuid', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'workers_birth_year_check', expression: '((birth_year >= 1900) AND (birth_year <= 2100))' },
    { name: 'workers_sex_check', expression: "(sex = ANY (ARRAY['F'::text, 'M'::text, 'X'::text]))" },
  ],
  foreignKeys: [{ name: 'workers_first_intake_id_fkey', target: 'Intake', columnNames: ['first_intake_id'], referencedColumnNames: ['id'] }],
});
