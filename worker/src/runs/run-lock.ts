import type { QueryRunner } from 'typeorm';

/**
 * The PostgreSQL advisory lock that makes a run happen once across any number of workers. It is
 * a session lock on the run's own dedicated connection: released at the end of the run, or by
 * the database itself when a crashed worker's connection goes away.
 */
export const RUN_LOCK_KEY = 7_143_220_601; // arbitrary, fixed: "the run" for every Ratewarden process

/** Takes the lock if it is free; false when another process is running. */
export async function tryRunLock(qr: QueryRunner): Promise<boolean> {
  const rows: Array<{ locked: boolean }> = await qr.query(`SELECT pg_try_advisory_lock($1) AS locked`, [RUN_LOCK_KEY]);
  return rows[0]?.locked === true;
}

/** Waits until the lock is free (for `npm run run-now` while a nightly run is in progress). */
export async function waitRunLock(qr: QueryRunner, timeoutMs: number, pollMs = 500): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (await tryRunLock(qr)) return true;
    if (Date.now() >= deadline) return false;
    await new Promise((r) => setTimeout(r, pollMs));
  }
}

export async function releaseRunLock(qr: QueryRunner): Promise<void> {
  await qr.query(`SELECT pg_advisory_unlock($1)`, [RUN_LOCK_KEY]);
}
