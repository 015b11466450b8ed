import { EntitySchema } from 'typeorm';
import type { RuleMeasure, ThresholdOn, RuleWindow } from '@ratewarden/shared/rules';

/** A watch rule: which measure of which outcome × group raises a flag, and who is told. */
export interface WatchRuleRow {
  id: string;
  name: string;
  outcomeId: number;
  /** null: every group except the reference group. */
  exposureGroupId: number | null;
  /** null: the whole company; else the sites watched, each on its own results. */
  siteIds: number[] | null;
  measure: RuleMeasure;
  thresholdOn: ThresholdOn;
  threshold: number | null;
  minCases: number;
  minExpected: number;
  windowKind: RuleWindow;
  consecutivePeriods: number;
  fdrControl: boolean;
  fdrLevel: number;
  recipients: string[];
  active: boolean;
  createdBy: string | null;
  createdAt: Date;
  updatedAt: Date;
}

export const WatchRuleEntity = new EntitySchema<WatchRuleRow>({
  name: 'WatchRule',
  tableName: 'watch_rules',
  columns: {
    id: { type: 'uuid', primary: true, generated: 'uuid' },
    name: { type: 'text' },
    outcomeId: { name: 'outcome_id', type: 'integer' },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer', nullable: true },
    siteIds: { name: 'site_ids', type: 'integer', array: true, nullable: true },
    measure: { type: 'text' },
    thresholdOn: { name: 'threshold_on', type: 'text' },
    threshold: { type: 'double precision', nullable: true },
    minCases: { name: 'min_cases', type: 'integer', default: 5 },
    minExpected: { name: 'min_expected', type: 'double precision', default: 0 },
    windowKind: { name: 'window_kind', type: 'text' },
    consecutivePeriods: { name: 'consecutive_periods', type: 'integer', default: 1 },
    fdrControl: { name: 'fdr_control', type: 'boolean', default: true },
    fdrLevel: { name: 'fdr_level', type: 'double precision', default: () => '0.05' },
    recipients: { type: 'text', array: true, default: () => "'{}'" },
    active: { type: 'boolean', default: true },
    createdBy: { name: 'created_by', type: 'uuid', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    updatedAt: { name: 'updated_at', type: 'timestamptz', updateDate: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'watch_rules_check', expression: "((measure = 'uchart'::text) OR (threshold IS NOT NULL))" },
    { name: 'watch_rules_consecutive_periods_check', expression: '((consecutive_periods >= 1) AND (consecutive_periods <= 24))' },
    { name: 'watch_rules_fdr_level_check', expression: '((fdr_level > (0)::double precision) AND (fdr_level < (1)::double precision))' },
    { name: 'watch_rules_measure_check', expression: "(measure = ANY (ARRAY['irr'::text, 'ird'::text, 'rate'::text, 'uchart'::text, 'sir'::text]))" },
    { name: 'watch_rules_min_cases_check', expression: '(min_cases >= 0)' },
    { name: 'watch_rules_min_expected_check', expression: '(min_expected >= (0)::double precision)' },
    {
      name: 'watch_rules_site_ids_check',
      expression: '((site_ids IS NULL) OR ((cardinality(site_ids) > 0) AND (array_position(site_ids, NULL::integer) IS NULL)))',
    },
    { name: 'watch_rules_threshold_on_check', expression: "(threshold_on = ANY (ARRAY['estimate'::text, 'lower_bound'::text]))" },
    { name: 'watch_rules_window_kind_check', expression: "(window_kind = ANY (ARRAY['month'::text, 'rolling12'::text]))" },
  ],
  foreignKeys: [
    { name: 'watch_rules_created_by_fkey', target: 'User', columnNames: ['created_by'], referencedColumnNames: ['id'] },
    { name: 'watch_rules_exposure_group_id_fkey', target: 'ExposureGroup', columnNames: ['exposure_group_id'], referencedColumnNames: ['id'] },
    { name: 'watch_rules_outcome_id_fkey', target: 'Outcome', columnNames: ['outcome_id'], referencedColumnNames: ['id'] },
  ],
});
