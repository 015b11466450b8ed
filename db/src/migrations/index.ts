import { Foundation1764633600000 } from './1764633600000-Foundation';
import { CohortData1764633700000 } from './1764633700000-CohortData';
import { IntakeStaging1764633800000 } from './1764633800000-IntakeStaging';
import { Access1764634000000 } from './1764634000000-Access';
import { Runs1764633900000 } from './1764633900000-Runs';
import { RunScopes1764634100000 } from './1764634100000-RunScopes';
import { RunCells1764634200000 } from './1764634200000-RunCells';
import { WatchRuleMinCases1764634300000 } from './1764634300000-WatchRuleMinCases';
import { NoticeDelivery1764634400000 } from './1764634400000-NoticeDelivery';

import { DisclosureFrame1764634500000 } from './1764634500000-DisclosureFrame';
import { RunUnattributed1764634800000 } from './1764634800000-RunUnattributed';
import { ReportingPeriods1764634600000 } from './1764634600000-ReportingPeriods';
import { SiteWatchRules1764634750000 } from './1764634750000-SiteWatchRules';
import { RunRequestImmediate1764634700000 } from './1764634700000-RunRequestImmediate';

import { RunPeriodRoster1764634900000 } from './1764634900000-RunPeriodRoster';
import { RosterSums1764635900000 } from './1764635900000-RosterSums';
import { ConfigAndRunsVersions1764636000000 } from './1764636000000-ConfigAndRunsVersions';
import { Audiograms1764635300000 } from './1764635300000-Audiograms';
import { DropRunTrends1764635700000 } from './1764635700000-DropRunTrends';
import { DataVersions1764635500000 } from './1764635500000-DataVersions';
import { CaseReviews1764635000000 } from './1764635000000-CaseReviews';
import { NoticeInbox1764635010000 } from './1764635010000-NoticeInbox';
import { FlagClinicalNotes1764635020000 } from './1764635020000-FlagClinicalNotes';
import { IntakeCaseConflicts1764635030000 } from './1764635030000-IntakeCaseConflicts';
import { ReferenceRates1764635200000 } from './1764635200000-ReferenceRates';
import { AnalysisSettings1764635100000 } from './1764635100000-AnalysisSettings';
import { AnalysisWindows1764635400000 } from './1764635400000-AnalysisWindows';
/** Every migration, oldest first. Listed by hand because the TypeORM CLI cannot glob TypeScript under tsx. */
export const migrations = [
  Foundation1764633600000,
  CohortData1764633700000,
  IntakeStaging1764633800000,
  Access1764634000000,
  Runs1764633900000,
  RunScopes1764634100000,
  RunCells1764634200000,
  WatchRuleMinCases1764634300000,
  NoticeDelivery1764634400000,
  DisclosureFrame1764634500000,
  ReportingPeriods1764634600000,
  RunRequestImmediate1764634700000,
  SiteWatchRules1764634750000,
  RunUnattributed1764634800000,
  RunPeriodRoster1764634900000,
  CaseReviews1764635000000,
  NoticeInbox1764635010000,
  FlagClinicalNotes1764635020000,
  IntakeCaseConflicts1764635030000,
  AnalysisSettings1764635100000,
  ReferenceRates1764635200000,
  Audiograms1764635300000,
  AnalysisWindows1764635400000,
  DataVersions1764635500000,
  DropRunTrends1764635700000,
  RosterSums1764635900000,
  ConfigAndRunsVersions1764636000000,
];
