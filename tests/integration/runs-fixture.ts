import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import type { RunSettings } from '@ratewarden/shared/runs';

/**
 * A private cohort for the run tests, inserted with plain SQL: sites, exposure groups and
 * outcomes with codes of their own, one applied roster intake and one cases intake. Months are
 * in 2031 so that the rolling windows of these tests never meet rows of other test files.
 */
export interface Cohort {
  tag: string;
  sites: number[];
  groups: Record<string, number>;
  outcomes: Record<string, number>;
  rosterIntake: string;
  casesIntake: string;
  worker(key: string, birthYear: number | null, sex: 'F' | 'M' | 'X' | null): Promise<number>;
  roster(rows: Array<[worker: number, month: string, site: number, group: number, hours: number]>): Promise<void>;
  cases(rows: Array<[worker: number, outcome: number, onset: string, status?: 'suspected' | 'confirmed' | 'ruled_out']>): Promise<void>;
}

export const settings: RunSettings = { personTimeBasis: 'person_years', per: 1000, confidence: 0.95, countedStatuses: ['confirmed'] };

async function intake(ds: DataSource, kind: 'roster' | 'cases', siteIds: number[]): Promise<string> {
  const [row] = (await ds.query(
    `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at)
     VALUES ($1, 'applied', $2, $3, 1, $4, 'run-tests', now()) RETURNING id`,
    [kind, `${kind}.csv`, randomBytes(32).toString('hex'), siteIds],
  )) as Array<{ id: string }>;
  return row!.id;
}

export async function makeCohort(
  ds: DataSource,
  spec: {
    groups: Array<[name: string, level: number | null]>;
    reference: string;
    outcomes: Array<[name: string, rule: 'recurrent' | 'first_event', lag?: number]>;
  },
): Promise<Cohort> {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const sites = (
    (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Run test site one'), ($2, 'Run test site two') RETURNING id`, [
      `RA${tag}`,
      `RB${tag}`,
    ])) as Array<{ id: number }>
  ).map((s) => s.id);
  const groups: Record<string, number> = {};
  for (const [name, level] of spec.groups) {
    const [g] = (await ds.query(`INSERT INTO exposure_groups (code, name, hazard, exposure_level) VALUES ($1, $2, 'test', $3) RETURNING id`, [
      `${name}${tag}`,
      `Group ${name}`,
      level,
    ])) as Array<{ id: number }>;
    groups[name] = g!.id;
  }
  const outcomes: Record<string, number> = {};
  for (const [name, rule, lag] of spec.outcomes) {
    const [o] = (await ds.query(
      `INSERT INTO outcomes (code, name, case_definition, counting_rule, lag_months, reference_group_id) VALUES ($1, $2, 'test', $3, $4, $5) RETURNING id`,
      [`${name}${tag}`, `Outcome ${name}`, rule, lag ?? 0, groups[spec.reference]],
    )) as Array<{ id: number }>;
    outcomes[name] = o!.id;
  }
  const rosterIntake = await intake(ds, 'roster', sites);
  const casesIntake = await intake(ds, 'cases', sites);
  let caseNo = 0;
  return {
    tag,
    sites,
    groups,
    outcomes,
    rosterIntake,
    casesIntake,
    async worker(key, birthYear, sex) {
      const [w] = (await ds.query(`INSERT INTO workers (worker_key, birth_year, sex) VALUES ($1, $2, $3) RETURNING id`, [
        `${tag}-${key}`,
        birthYear,
        sex,
      ])) as Array<{ id: string }>;
      return Number(w!.id);
    },
    async roster(rows) {
      await ds.query(
        `INSERT INTO roster_entries (intake_id, worker_id, month, site_id, exposure_group_id, hours)
         SELECT $1, w, m, s, g, h FROM unnest($2::bigint[], $3::date[], $4::int[], $5::int[], $6::numeric[]) AS x(w, m, s, g, h)`,
        [rosterIntake, rows.map((r) => r[0]), rows.map((r) => r[1]), rows.map((r) => r[2]), rows.map((r) => r[3]), rows.map((r) => r[4])],
      );
      await ds.query(
        `INSERT INTO roster_slices (site_id, month, intake_id)
         SELECT DISTINCT site_id, month, $1::uuid FROM roster_entries WHERE intake_id = $1
         ON CONFLICT (site_id, month) DO UPDATE SET intake_id = EXCLUDED.intake_id`,
        [rosterIntake],
      );
      // The case list reports every rostered month of the cohort's sites: those months are complete.
      await ds.query(
        `UPDATE intakes SET reports_site_ids = $2, reports_through = (SELECT max(month) FROM roster_slices WHERE site_id = ANY($2)) WHERE id = $1`,
        [casesIntake, sites],
      );
    },
    async cases(rows) {
      for (const [worker, outcome, onset, status] of rows) {
        caseNo++;
        await ds.query(`INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status) VALUES ($1, $2, $3, $4, $5, $6)`, [
          casesIntake,
          `${tag}-C${caseNo}`,
          worker,
          outcome,
          onset,
          status ?? 'confirmed',
        ]);
      }
    },
  };
}

/** Stored results of one run for one outcome, keyed "group:window:period": company-wide, or of one site when `siteId` is given. */
export async function storedResults(
  ds: DataSource,
  runId: string,
  outcomeId: number,
  siteId: number | null = null,
): Promise<Map<string, Record<string, unknown>>> {
  const rows = (await ds.query(
    `SELECT *, to_char(period, 'YYYY-MM') AS p FROM run_results WHERE run_id = $1 AND outcome_id = $2 AND site_id IS NOT DISTINCT FROM $3::int`,
    [runId, outcomeId, siteId],
  )) as Array<Record<string, unknown>>;
  return new Map(rows.map((r) => [`${r.exposure_group_id as number}:${r.window_kind as string}:${r.p as string}`, r]));
}

export async function currentRunId(ds: DataSource): Promise<string | null> {
  const rows = (await ds.query(`SELECT run_id FROM current_run`)) as Array<{ run_id: string }>;
  return rows[0]?.run_id ?? null;
}

/**
 * Runs are company-wide, so a run test must see no cohort rows of other test files: empties the
 * cohort, run, flag and month-closing tables (configuration rows other tests made go with them).
 */
export async function clearCohortData(ds: DataSource): Promise<void> {
  await ds.query(`TRUNCATE run_requests, current_run, run_results, run_cells, runs, flag_events, notices, flags, watch_rules, dev_mailbox,
    case_events, roster_entries, roster_slices, workers, intakes, period_closures RESTART IDENTITY CASCADE`);
}
