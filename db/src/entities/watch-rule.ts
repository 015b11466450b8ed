import { EntitySchema } from 'typeorm';
import type { RuleMeasure, ThresholdOn, WindowKind } from '@ratewarden/shared/rules';

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
  windowKind: WindowKind;
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
    fdrLevel: { name: 'fdr_level', type: 'double precision', default: 0.05 },
    recipients: { type: 'text', array: true, default: () => "'{}'" },
    active: { type: 'boolean', default: true },
    createdBy: { name: 'created_by', type: 'uuid', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    updatedAt: { name: 'updated_at', type: 'timestamptz', updateDate: true },
  },
});
