import type { EntityManager, DataSource } from 'typeorm';
import { rows } from '@ratewarden/db';
import type { EarAudiogram } from '@ratewarden/shared/hearing/audiogram';
import { workerHearingHistory, type EarHistory, type HearingSettings } from '@ratewarden/shared/hearing/audiometric-history';

type Db = DataSource | EntityManager;

interface AudiogramRecord {
  id: string;
  worker_id: string;
  worker_key: string;
  sex: string | null;
  birth_year: number | null;
  test_date: string;
  ear: 'left' | 'right';
  test_type: 'baseline' | 'annual' | 'retest';
  hl_500: number;
  hl_1000: number;
  hl_2000: number;
  hl_3000: number;
  hl_4000: number;
  hl_6000: number;
  hl_8000: number | null;
}

export interface WorkerHearing {
  workerId: string;
  workerKey: string;
  sex: string | null;
  birthYear: number | null;
  audiograms: EarAudiogram[];
  ears: EarHistory[];
}

/** Every stored audiogram of the workers, read into their histories (shared/src/hearing). */
export async function loadWorkerHearing(db: Db, workerIds: string[], settings: HearingSettings): Promise<WorkerHearing[]> {
  if (!workerIds.length) return [];
  const records = await rows<AudiogramRecord>(
    db,
    `SELECT a.id::text, a.worker_id::text, w.worker_key, w.sex, w.birth_year, to_char(a.test_date, 'YYYY-MM-DD') AS test_date, a.ear, a.test_type,
            a.hl_500, a.hl_1000, a.hl_2000, a.hl_3000, a.hl_4000, a.hl_6000, a.hl_8000
     FROM audiograms a JOIN workers w ON w.id = a.worker_id
     WHERE a.worker_id = ANY($1::bigint[]) ORDER BY a.worker_id, a.test_date, a.id`,
    [workerIds],
  );
  const byWorker = new Map<string, AudiogramRecord[]>();
  for (const r of records) byWorker.set(r.worker_id, [...(byWorker.get(r.worker_id) ?? []), r]);
  return [...byWorker.values()].map((rs) => {
    const first = rs[0]!;
    const audiograms: EarAudiogram[] = rs.map((r) => ({
      id: r.id,
      testDate: r.test_date,
      ear: r.ear,
      testType: r.test_type,
      thresholds: { 500: r.hl_500, 1000: r.hl_1000, 2000: r.hl_2000, 3000: r.hl_3000, 4000: r.hl_4000, 6000: r.hl_6000, 8000: r.hl_8000 },
    }));
    const person = { sex: first.sex, birthYear: first.birth_year };
    return {
      workerId: first.worker_id,
      workerKey: first.worker_key,
      sex: first.sex,
      birthYear: first.birth_year,
      audiograms,
      ears: workerHearingHistory(audiograms, person, settings),
    };
  });
}

/** The case reference of the shifts found on one test date (either ear): stable across uploads. */
export const shiftCaseRef = (workerKey: string, testDate: string) => `STS-${workerKey}-${testDate}`;
