import { EntitySchema } from 'typeorm';
import type { RunInputs, RunSettings, RunState, RunTrigger } from '@ratewarden/shared/runs';

/** One computation run: its inputs, settings, code version and outcome. */
export interface Run {
  id: string;
  number: string;
  trigger: RunTrigger;
  reason: string | null;
  state: RunState;
  startedAt: Date;
  finishedAt: Date | null;
  error: string | null;
  inputs: RunInputs;
  settings: RunSettings;
  /** The version of the analysis settings the run used (null for runs before versions). */
  settingsVersion: number | null;
  codeVersion: string;
  /** host:pid of the process that ran it. */
  worker: string;
  summary: Record<string, unknown>;
  /** Whether the run stored a disclosure frame (runs before the frame existed did not). */
  disclosureFrame: boolean;
}

export const RunEntity = new EntitySchema<Run>({
  name: 'Run',
  tableName: 'runs',
  columns: {
    id: { type: 'uuid', primary: true, generated: 'uuid' },
    number: { type: 'bigint', generated: 'increment', unique: true },
    trigger: { type: 'text' },
    reason: { type: 'text', nullable: true },
    state: { type: 'text', default: 'running' },
    startedAt: { name: 'started_at', type: 'timestamptz', createDate: true },
    finishedAt: { name: 'finished_at', type: 'timestamptz', nullable: true },
    error: { type: 'text', nullable: true },
    inputs: { type: 'jsonb', default: () => "'{}'" },
    settings: { type: 'jsonb' },
    settingsVersion: { name: 'settings_version', type: 'integer', nullable: true },
    codeVersion: { name: 'code_version', type: 'text' },
    worker: { type: 'text' },
    summary: { type: 'jsonb', default: () => "'{}'" },
    disclosureFrame: { name: 'disclosure_frame', type: 'boolean', default: false },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'runs_state_check', expression: "(state = ANY (ARRAY['running'::text, 'succeeded'::text, 'failed'::text]))" },
    { name: 'runs_trigger_check', expression: "(trigger = ANY (ARRAY['schedule'::text, 'request'::text, 'cli'::text, 'bench'::text]))" },
  ],
  indices: [{ name: 'runs_started', columns: ['startedAt'] }],
  foreignKeys: [{ name: 'runs_settings_version_fkey', target: 'AnalysisSettings', columnNames: ['settings_version'], referencedColumnNames: ['version'] }],
});
