import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';

/**
 * A worker with audiograms, stored by SQL as an upload would store them: a baseline and an
 * annual test of both ears, the left ear 15 dB worse at 2000, 3000 and 4000 Hz (a standard
 * threshold shift, 29 CFR 1910.95(g)(10)). Returns the worker key.
 */
export async function plantAudiograms(ds: DataSource, sites: number[]): Promise<string> {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const workerKey = `AUD${tag}-1`;
  const [intake] = (await ds.query(
    `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at) VALUES ('cases', 'applied', 'audiograms.csv', $1, 1, $2, 'browser-test', now()) RETURNING id`,
    [randomBytes(32).toString('hex'), sites],
  )) as Array<{ id: string }>;
  const [w] = (await ds.query(`INSERT INTO workers (worker_key, birth_year, sex) VALUES ($1, 1990, 'M') RETURNING id`, [workerKey])) as Array<{ id: string }>;
  await ds.query(
    `INSERT INTO audiograms (intake_id, worker_id, test_date, ear, test_type, hl_500, hl_1000, hl_2000, hl_3000, hl_4000, hl_6000, hl_8000) VALUES
     ($1, $2, '2024-06-10', 'left', 'baseline', 5, 5, 5, 5, 10, 10, 15), ($1, $2, '2024-06-10', 'right', 'baseline', 5, 5, 5, 5, 10, 10, NULL),
     ($1, $2, '2025-06-10', 'left', 'annual', 5, 5, 20, 20, 25, 20, 20), ($1, $2, '2025-06-10', 'right', 'annual', 5, 5, 5, 5, 10, 10, NULL)`,
    [intake!.id, w!.id],
  );
  return workerKey;
}
