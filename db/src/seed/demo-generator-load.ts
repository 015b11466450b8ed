import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import type { EntityManager } from 'typeorm';
import { requestRun } from '../run-requests';
import {
  caseCsvHeader,
  caseCsvLine,
  demoCohortShape,
  generateCohort,
  rosterCsvHeader,
  rosterCsvLine,
  type CaseRow,
  type RosterRow,
  type CohortShape,
} from './demo-generator';

/** COPY text format: tab-separated, \N for null; our generated values hold no tabs or backslashes. */
const tsv = (values: Array<string | number | null>) => `${values.map((v) => (v === null ? '\\N' : String(v))).join('\t')}\n`;

/** Lines joined into 64 KiB chunks: one COPY message per line would cost more than the rows. */
function* chunked(lines: Iterable<string>): Generator<string> {
  let buf = '';
  for (const l of lines) {
    buf += l;
    if (buf.length >= 65536) {
      yield buf;
      buf = '';
    }
  }
  if (buf) yield buf;
}

async function copyLines(client: PoolClient, sql: string, lines: Iterable<string>): Promise<void> {
  await pipeline(Readable.from(chunked(lines)), client.query(copyFrom(sql)));
}

/**
 * Loads the generated cohort into an empty store by direct COPY, as intakes would have left it:
 * one applied roster intake per site and one applied case-list intake, each with the checksum of
 * the CSV file it stands for (so uploading that very file later is recognized as a duplicate),
 * every site × month pointing at its intake, and a run requested. Runs in the caller's transaction.
 */
export async function loadDemoCohort(
  em: EntityManager,
  shape: CohortShape = demoCohortShape(['NFD', 'RVW', 'HLA', 'EYD']),
): Promise<{ rosterRows: number; cases: number }> {
  const client = (await em.queryRunner!.connect()) as PoolClient;
  const roster: RosterRow[] = [];
  const cases: CaseRow[] = [];
  generateCohort(
    shape,
    (r) => roster.push(r),
    (c) => cases.push(c),
  );

  const ids = (table: string, key: string) =>
    em.query(`SELECT id, ${key} AS k FROM ${table}`).then((rows: Array<{ id: number | string; k: string }>) => new Map(rows.map((r) => [r.k, r.id])));
  const siteIds = await ids('sites', 'code');
  const groupIds = await ids('exposure_groups', 'code');
  const outcomeIds = await ids('outcomes', 'code');

  const intakeOf = new Map<string, string>();
  for (const site of shape.sites) {
    const rows = roster.filter((r) => r.site === site);
    const hash = createHash('sha256').update(rosterCsvHeader);
    for (const r of rows) hash.update(rosterCsvLine(r));
    const months = rows.map((r) => r.month).sort();
    const [{ id }] = await em.query(
      `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, month_from, month_to, row_count, submitted_by_client, checked_at, applied_at, diff)
       VALUES ('roster', 'applied', $1, $2, 0, $3, $4, $5, $6, 'demo-generator', now(), now(), NULL) RETURNING id`,
      [`kestrelmoor-roster-${site.toLowerCase()}.csv`, hash.digest('hex'), [siteIds.get(site)], `${months[0]}-01`, `${months.at(-1)}-01`, rows.length],
    );
    intakeOf.set(site, id);
  }

  const firstSite = new Map<string, RosterRow>();
  for (const r of roster) if (!firstSite.has(r.workerKey)) firstSite.set(r.workerKey, r);
  await copyLines(
    client,
    `COPY workers (worker_key, birth_year, sex, first_intake_id) FROM STDIN`,
    [...firstSite.values()].map((r) => tsv([r.workerKey, r.birthYear, r.sex, intakeOf.get(r.site)!])),
  );
  const workerIds = await ids('workers', 'worker_key');

  await copyLines(
    client,
    `COPY roster_entries (intake_id, worker_id, month, site_id, exposure_group_id, hours, job_title) FROM STDIN`,
    (function* () {
      for (const r of roster)
        yield tsv([intakeOf.get(r.site)!, workerIds.get(r.workerKey)!, `${r.month}-01`, siteIds.get(r.site)!, groupIds.get(r.group)!, r.hours, r.jobTitle]);
    })(),
  );
  await em.query(`INSERT INTO roster_slices (site_id, month, intake_id) SELECT DISTINCT site_id, month, intake_id FROM roster_entries`);

  const caseHash = createHash('sha256').update(caseCsvHeader);
  for (const c of cases) caseHash.update(caseCsvLine(c));
  const [{ id: caseIntake }] = await em.query(
    `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, row_count, submitted_by_client, checked_at, applied_at, reports_site_ids, reports_through)
     VALUES ('cases', 'applied', 'kestrelmoor-cases.csv', $1, 0, $2, $3, 'demo-generator', now(), now(), $2, (SELECT max(month) FROM roster_slices)) RETURNING id`,
    [caseHash.digest('hex'), [...siteIds.values()], cases.length],
  );
  // The hygienist has closed every month but the last three of each site.
  await em.query(`
    INSERT INTO period_closures (site_id, month, action, reason)
    SELECT site_id, month, 'close', 'demo: month reviewed and closed' FROM roster_slices rs
    WHERE month <= (SELECT max(month) FROM roster_slices x WHERE x.site_id = rs.site_id) - interval '3 months'`);
  await copyLines(
    client,
    `COPY case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status) FROM STDIN`,
    cases.map((c) => tsv([caseIntake, c.caseRef, workerIds.get(c.workerKey)!, outcomeIds.get(c.outcome)!, c.onsetDate, c.status])),
  );
  // The demo's first figures should not wait for uploads to settle: nothing else is coming.
  await requestRun(em, 'demo scenario loaded', { intakeId: caseIntake, immediate: true });
  return { rosterRows: roster.length, cases: cases.length };
}
