/** What the API answers about audiograms; the web app imports these types. */
import type { AudiogramTestType, Ear, EarThresholds } from './audiogram';
import type { EarHistory } from './audiometric-history';
import type { AudiogramProblem } from './audiogram-rows';

/** The hygienist's answer to an upload: rows stored, never the shifts derived (case-level). */
export interface AudiogramUploadResponse {
  intakeId: string;
  rows: number;
  workers: number;
}

export interface AudiogramUploadRejected {
  problems: AudiogramProblem[];
  problemCount: number;
}

export interface HearingWorkerSummary {
  workerKey: string;
  tests: number;
  lastTestDate: string;
  shifts: number;
}

export interface HearingWorkerListResponse {
  workers: HearingWorkerSummary[];
}

export interface StoredAudiogram {
  id: string;
  testDate: string;
  ear: Ear;
  testType: AudiogramTestType;
  thresholds: EarThresholds;
}

export interface HearingWorkerResponse {
  workerKey: string;
  sex: string | null;
  birthYear: number | null;
  settings: { ageCorrection: boolean };
  audiograms: StoredAudiogram[];
  ears: EarHistory[];
  cases: { caseRef: string; onsetDate: string; status: string }[];
}
