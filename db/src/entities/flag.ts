import { EntitySchema } from 'typeorm';
import type { CloseReason, FlagFigures, FlagState } from '@ratewarden/shared/flags';

/** What a watch rule raised for one exposure group × outcome in one scope; at most one open per rule × group × outcome × scope. */
export interface FlagRow {
  id: string;
  ruleId: string;
  outcomeId: number;
  exposureGroupId: number;
  /** The site whose results crossed the rule; null: the whole company. */
  siteId: number | null;
  state: FlagState;
  closeReason: CloseReason | null;
  closeComment: string | null;
  raisedRunId: string;
  lastRunId: string;
  period: string;
  /** The measure compared with the rule (estimate or lower bound) in the latest run. */
  value: number;
  /** The worst value seen while the flag was open; a closed flag re-raises only past it. */
  worstValue: number;
  /** Whether the latest run still crosses the rule. */
  crossing: boolean;
  detail: FlagFigures;
  raisedAt: Date;
  updatedAt: Date;
  closedAt: Date | null;
  closedBy: string | null;
}

export const FlagEntity = new EntitySchema<FlagRow>({
  name: 'Flag',
  tableName: 'flags',
  columns: {
    id: { type: 'uuid', primary: true, generated: 'uuid' },
    ruleId: { name: 'rule_id', type: 'uuid' },
    outcomeId: { name: 'outcome_id', type: 'integer' },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer' },
    siteId: { name: 'site_id', type: 'integer', nullable: true },
    state: { type: 'text', default: 'raised' },
    closeReason: { name: 'close_reason', type: 'text', nullable: true },
    closeComment: { name: 'close_comment', type: 'text', nullable: true },
    raisedRunId: { name: 'raised_run_id', type: 'uuid' },
    lastRunId: { name: 'last_run_id', type: 'uuid' },
    period: { type: 'date' },
    value: { type: 'double precision' },
    worstValue: { name: 'worst_value', type: 'double precision' },
    crossing: { type: 'boolean', default: true },
    detail: { type: 'jsonb' },
    raisedAt: { name: 'raised_at', type: 'timestamptz', createDate: true },
    updatedAt: { name: 'updated_at', type: 'timestamptz', updateDate: true },
    closedAt: { name: 'closed_at', type: 'timestamptz', nullable: true },
    closedBy: { name: 'closed_by', type: 'uuid', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'flags_check', expression: "((state = 'closed'::text) = (close_reason IS NOT NULL))" },
    { name: 'flags_close_reason_check', expression: "(close_reason = ANY (ARRAY['explained'::text, 'action_taken'::text, 'not_substantiated'::text]))" },
    { name: 'flags_state_check', expression: "(state = ANY (ARRAY['raised'::text, 'in_review'::text, 'closed'::text]))" },
  ],
  indices: [
    { name: 'flags_one_open', columns: ['ruleId', 'exposureGroupId', 'outcomeId'], unique: true, where: "(state <> 'closed'::text)", synchronize: false },
    { name: 'flags_site', columns: ['siteId'], where: '(site_id IS NOT NULL)' },
    { name: 'flags_state', columns: ['state', 'raisedAt'] },
  ],
  foreignKeys: [
    { name: 'flags_closed_by_fkey', target: 'User', columnNames: ['closed_by'], referencedColumnNames: ['id'] },
    { name: 'flags_exposure_group_id_fkey', target: 'ExposureGroup', columnNames: ['exposure_group_id'], referencedColumnNames: ['id'] },
    { name: 'flags_last_run_id_fkey', target: 'Run', columnNames: ['last_run_id'], referencedColumnNames: ['id'] },
    { name: 'flags_outcome_id_fkey', target: 'Outcome', columnNames: ['outcome_id'], referencedColumnNames: ['id'] },
    { name: 'flags_raised_run_id_fkey', target: 'Run', columnNames: ['raised_run_id'], referencedColumnNames: ['id'] },
    { name: 'flags_rule_id_fkey', target: 'WatchRule', columnNames: ['rule_id'], referencedColumnNames: ['id'] },
    { name: 'flags_site_id_fkey', target: 'Site', columnNames: ['site_id'], referencedColumnNames: ['id'] },
  ],
});
