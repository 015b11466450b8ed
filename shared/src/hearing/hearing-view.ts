/** What the API answers about audiograms: zod schemas the web app parses with, and their types. */
import { z } from 'zod';
import type { EarHistory } from './audiometric-history';
import { earSchema, testTypeSchema } from './audiogram-rows';

/** The hygienist's answer to an upload: rows stored, never the shifts derived (case-level). */
export const audiogramUploadResponseSchema = z.object({ intakeId: z.string(), rows: z.number().int(), workers: z.number().int() });
export type AudiogramUploadResponse = z.infer<typeof audiogramUploadResponseSchema>;

export const hearingWorkerSummarySchema = z.object({ workerKey: z.string(), tests: z.number().int(), lastTestDate: z.string(), shifts: z.number().int() });
export type HearingWorkerSummary = z.infer<typeof hearingWorkerSummarySchema>;

export const hearingWorkerListResponseSchema = z.object({ workers: z.array(hearingWorkerSummarySchema) });
export type HearingWorkerListResponse = z.infer<typeof hearingWorkerListResponseSchema>;

const level = z.number().int();
export const storedAudiogramSchema = z.object({
  id: z.string(),
  testDate: z.string(),
  ear: earSchema,
  testType: testTypeSchema,
  thresholds: z.object({ 500: level, 1000: level, 2000: level, 3000: level, 4000: level, 6000: level, 8000: level.nullable().optional() }),
});
export type StoredAudiogram = z.infer<typeof storedAudiogramSchema>;

const earHistorySchema = z.custom<EarHistory>(
  (v) => typeof v === 'object' && v !== null && Array.isArray((v as EarHistory).steps) && Array.isArray((v as EarHistory).shifts),
);

export const hearingWorkerResponseSchema = z.object({
  workerKey: z.string(),
  sex: z.string().nullable(),
  birthYear: z.number().int().nullable(),
  settings: z.object({ ageCorrection: z.boolean() }),
  audiograms: z.array(storedAudiogramSchema),
  ears: z.array(earHistorySchema),
  cases: z.array(z.object({ caseRef: z.string(), onsetDate: z.string(), status: z.string() })),
});
export type HearingWorkerResponse = z.infer<typeof hearingWorkerResponseSchema>;
