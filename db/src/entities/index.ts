import { AuditEventEntity } from './audit-event';
import { CaseEventEntity } from './case-event';
import { IntakeEntity } from './intake';
import { RosterEntryEntity } from './roster-entry';
import { RosterSliceEntity } from './roster-slice';
import { WorkerEntity } from './worker';
import { ExposureGroupEntity } from './exposure-group';
import { OutcomeEntity } from './outcome';
import { SiteEntity } from './site';
import { UserEntity } from './user';
import { UserSiteEntity } from './user-site';

export const entities = [SiteEntity, ExposureGroupEntity, OutcomeEntity, UserEntity, UserSiteEntity, AuditEventEntity,
  IntakeEntity, WorkerEntity, RosterEntryEntity, RosterSliceEntity, CaseEventEntity];

export type { AuditEvent } from './audit-event';
export type { CaseEvent } from './case-event';
export type { Intake } from './intake';
export type { RosterEntry } from './roster-entry';
export type { RosterSlice } from './roster-slice';
export type { Worker } from './worker';
export type { ExposureGroup } from './exposure-group';
export type { Outcome } from './outcome';
export type { Site } from './site';
export type { User } from './user';
export type { UserSite } from './user-site';
export { AuditEventEntity, CaseEventEntity, IntakeEntity, RosterEntryEntity, RosterSliceEntity, WorkerEntity, ExposureGroupEntity, OutcomeEntity, SiteEntity, UserEntity, UserSiteEntity };
