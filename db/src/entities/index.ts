import { AuditEventEntity } from './audit-event';
import { ExposureGroupEntity } from './exposure-group';
import { OutcomeEntity } from './outcome';
import { SiteEntity } from './site';
import { UserEntity } from './user';
import { UserSiteEntity } from './user-site';

export const entities = [SiteEntity, ExposureGroupEntity, OutcomeEntity, UserEntity, UserSiteEntity, AuditEventEntity];

export type { AuditEvent } from './audit-event';
export type { ExposureGroup } from './exposure-group';
export type { Outcome } from './outcome';
export type { Site } from './site';
export type { User } from './user';
export type { UserSite } from './user-site';
export { AuditEventEntity, ExposureGroupEntity, OutcomeEntity, SiteEntity, UserEntity, UserSiteEntity };
