import type { EntityManager } from 'typeorm';
import { rows } from '@ratewarden/db';
import type { HearingSettings } from '@ratewarden/shared/hearing/audiometric-history';
import { loadWorkerHearing, shiftCaseRef } from './worker-hearing';

/**
 * Each standard threshold shift derived from the workers' audiograms becomes a suspected case of
 * the hearing outcome, carried by the intake of the upload, until the physician's case review
 * confirms or rules it out. A case reference already stored (in any status, from any intake) is
 * left as it is: a physician's decision is never overwritten by a new upload, and a shift that a
 * later retest no longer shows stays for the physician to rule out.
 *
 * @returns how many cases were added (case-level: for the physician and tests, never the uploader).
 */
export async function deriveShiftCases(
  em: EntityManager,
  intakeId: string,
  workerIds: string[],
  outcomeId: number,
  settings: HearingSettings,
): Promise<number> {
  const refs: string[] = [];
  const workers: string[] = [];
  const onsets: string[] = [];
  for (const w of await loadWorkerHearing(em, workerIds, settings)) {
    const dates = new Set(w.ears.flatMap((e) => e.shifts.map((s) => s.testDate)));
    for (const d of dates) {
      refs.push(shiftCaseRef(w.workerKey, d));
      workers.push(w.workerId);
      onsets.push(d);
    }
  }
  if (!refs.length) return 0;
  const inserted = await rows<{ id: string }>(
    em,
    `INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status)
     SELECT $1, n.ref, n.worker_id, $2, n.onset, 'suspected'
     FROM unnest($3::text[], $4::bigint[], $5::date[]) AS n(ref, worker_id, onset)
     WHERE NOT EXISTS (SELECT 1 FROM case_events e WHERE e.case_ref = n.ref)
     RETURNING id`,
    [intakeId, outcomeId, refs, workers, onsets],
  );
  return inserted.length;
}
