import { AuditEventEntity } from './audit-event';
import { CaseEventEntity } from './case-event';
import { IntakeEntity } from './intake';
import { IntegrationClientEntity } from './integration-client';
import { RosterEntryEntity } from './roster-entry';
import { RosterSliceEntity } from './roster-slice';
import { WorkerEntity } from './worker';
import { ExposureGroupEntity } from './exposure-group';
import { OutcomeEntity } from './outcome';
import { SiteEntity } from './site';
import { UserEntity } from './user';
import { UserSiteEntity } from './user-site';
import { CurrentRunEntity } from './current-run';
import { DevMailboxMessageEntity } from './dev-mailbox-message';
import { FlagEntity } from './flag';
import { FlagEventEntity } from './flag-event';
import { NoticeEntity } from './notice';
import { RunEntity } from './run';
import { RunCellsEntity } from './run-cells';
import { WatchRuleEntity } from './watch-rule';
import { RunUnattributedEntity } from './run-unattributed';
import { PeriodClosureEntity } from './period-closure';
import { RunPeriodEntity } from './run-period';
import { RunRequestEntity } from './run-request';
import { AudiogramEntity } from './audiogram';
import { CaseReviewEntity } from './case-review';
import { FlagNoteEntity } from './flag-note';
import { IntakeCaseConflictEntity } from './intake-case-conflict';
import { ReferenceRateTableEntity } from './reference-rate-table';
import { ReferenceRateEntity } from './reference-rate';
import { AnalysisSettingsEntity } from './analysis-settings';
import { DataVersionEntity } from './data-version';

export const entities = [
  SiteEntity,
  ExposureGroupEntity,
  OutcomeEntity,
  UserEntity,
  UserSiteEntity,
  AuditEventEntity,
  IntakeEntity,
  WorkerEntity,
  RosterEntryEntity,
  RosterSliceEntity,
  CaseEventEntity,
  IntegrationClientEntity,
  RunEntity,
  CurrentRunEntity,
  RunCellsEntity,
  WatchRuleEntity,
  FlagEntity,
  FlagEventEntity,
  NoticeEntity,
  DevMailboxMessageEntity,
  PeriodClosureEntity,
  RunPeriodEntity,
  RunUnattributedEntity,
  RunRequestEntity,
  AudiogramEntity,
  CaseReviewEntity,
  FlagNoteEntity,
  IntakeCaseConflictEntity,
  ReferenceRateTableEntity,
  ReferenceRateEntity,
  AnalysisSettingsEntity,
  DataVersionEntity,
];

export type { AuditEvent } from './audit-event';
export type { CaseEvent } from './case-event';
export type { Intake } from './intake';
export type { IntegrationClient } from './integration-client';
export type { RosterEntry } from './roster-entry';
export type { RosterSlice } from './roster-slice';
export type { Worker } from './worker';
export type { ExposureGroup } from './exposure-group';
export type { Outcome } from './outcome';
export type { Site } from './site';
export type { User } from './user';
export type { UserSite } from './user-site';
export {
  AuditEventEntity,
  CaseEventEntity,
  IntakeEntity,
  IntegrationClientEntity,
  RosterEntryEntity,
  RosterSliceEntity,
  WorkerEntity,
  ExposureGroupEntity,
  OutcomeEntity,
  SiteEntity,
  UserEntity,
  UserSiteEntity,
};
export type { Run } from './run';
export type { CurrentRun } from './current-run';
export type { RunCells } from './run-cells';
export type { WatchRuleRow } from './watch-rule';
export type { FlagRow } from './flag';
export type { FlagEventRow } from './flag-event';
export type { NoticeRow } from './notice';
export type { DevMailboxMessage } from './dev-mailbox-message';
export type { PeriodClosure } from './period-closure';
export type { RunPeriod } from './run-period';
export type { RunRequest } from './run-request';
export { RunRequestEntity };
export {
  RunEntity,
  CurrentRunEntity,
  RunCellsEntity,
  WatchRuleEntity,
  FlagEntity,
  FlagEventEntity,
  NoticeEntity,
  DevMailboxMessageEntity,
  PeriodClosureEntity,
  RunPeriodEntity,
};
export type { RunUnattributed } from './run-unattributed';
export { RunUnattributedEntity };
export type { Audiogram } from './audiogram';
export { AudiogramEntity };
export type { ReferenceRateTable } from './reference-rate-table';
export type { ReferenceRate } from './reference-rate';
export { ReferenceRateTableEntity, ReferenceRateEntity };
export type { AnalysisSettingsRow } from './analysis-settings';
export type { DataVersion } from './data-version';
export { DataVersionEntity };
