import { createWriteStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import pg from 'pg';
import { to as copyTo } from 'pg-copy-streams';

/** The benchmark's outcomes: one counted as recurrent events, one as first event only with a lag. */
export const BENCH_OUTCOMES = [
  { code: 'BINJ', name: 'Recordable injury (bench)', rule: 'recurrent', lag: 0, perRow: 0.0015, slope: 0.3, salt: 'inj' },
  { code: 'BHTS', name: 'Hearing threshold shift (bench)', rule: 'first_event', lag: 6, perRow: 0.0008, slope: 0.4, salt: 'hts' },
] as const;

/** Creates the benchmark's outcomes; returns their ids by code. */
export async function insertBenchOutcomes(client: pg.ClientBase): Promise<Map<string, number>> {
  const ids = new Map<string, number>();
  for (const o of BENCH_OUTCOMES) {
    const { rows } = await client.query<{ id: number }>(
      `INSERT INTO outcomes (code, name, case_definition, counting_rule, lag_months) VALUES ($1, $2, 'benchmark outcome', $3, $4) RETURNING id`,
      [o.code, o.name, o.rule, o.lag],
    );
    ids.set(o.code, rows[0]!.id);
  }
  return ids;
}

/**
 * An applied reference-rate table for the benchmark's outcomes, so that its runs compute the SIR
 * too (issue: a run with reference rates within the run target): each outcome × sex × ten-year
 * age band 15–24 … 75–84 × calendar year 2015–2035, at an invented rate of 1 to 4 per 100
 * person-years that rises with age. Inserted directly, as an applied upload would leave it.
 */
export async function insertBenchReferenceRates(client: pg.ClientBase, outcomeIds: number[]): Promise<void> {
  const { rows } = await client.query<{ id: number }>(
    `INSERT INTO reference_rate_tables (state, file_name, checksum, row_count, sources) VALUES ('applied', 'bench-rates.csv', repeat('0', 64), 0, '{bench}') RETURNING id`,
  );
  const tableId = rows[0]!.id;
  const { rowCount } = await client.query(
    `INSERT INTO reference_rates (table_id, outcome_id, sex, age_from, age_to, year, rate, source)
     SELECT $1, o, sx, a, a + 9, y, 0.01 + 0.004 * ((a - 15) / 10) + (CASE WHEN sx = 'F' THEN 0.002 ELSE 0 END), 'invented benchmark rates'
     FROM unnest($2::int[]) o, unnest(ARRAY['F', 'M']) sx, generate_series(15, 75, 10) a, generate_series(2015, 2035) y`,
    [tableId, outcomeIds],
  );
  await client.query(`UPDATE reference_rate_tables SET row_count = $2 WHERE id = $1`, [tableId, rowCount]);
}

/**
 * Gives the benchmark roster (already applied) its case list: for every outcome, each roster row
 * (one worker × month, about 150 h) turns into a case with a probability that grows with the
 * row's exposure level, drawn from a hash of worker, month and outcome so that the data is the
 * same on every run. Onsets fall inside the row's month; 90 % are confirmed, the rest suspected
 * or ruled out, so the run's status filter has work to do. At these probabilities the injury
 * rate is about 2 to 4 per 100 person-years, a plausible order for a manufacturing workforce.
 * Inserted through one applied "cases" intake, as an applied case intake would leave them; the
 * reference rates (insertBenchReferenceRates) go in with them.
 */
export async function addBenchCases(url: string): Promise<{ cases: number }> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query('BEGIN');
    const [intake] = (
      await client.query(
        `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, submitted_by_client, applied_at, checked_at)
         VALUES ('cases', 'applied', 'bench-cases.csv', repeat('0', 64), 0, 'bench', now(), now()) RETURNING id`,
      )
    ).rows as Array<{ id: string }>;
    let cases = 0;
    const outcomeIds = await insertBenchOutcomes(client);
    for (const o of BENCH_OUTCOMES) {
      const outcome = { id: outcomeIds.get(o.code)! };
      // u: a uniform draw in [0, 1) from the hash; the same draw picks the day and the status.
      const res = await client.query(
        `INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status)
         SELECT $1, $2 || '-' || d.worker_id || '-' || to_char(d.month, 'YYYYMM'), d.worker_id, $3,
                d.month + (floor(d.u2 * 28))::int,
                CASE WHEN d.u2 < 0.9 THEN 'confirmed' WHEN d.u2 < 0.96 THEN 'suspected' ELSE 'ruled_out' END
         FROM (
           SELECT r.worker_id, r.month,
                  (hashtext(r.worker_id || ':' || r.month || ':' || $2) & 2147483647) / 2147483648.0 AS u,
                  (hashtext($2 || ':' || r.worker_id || ':' || r.month) & 2147483647) / 2147483648.0 AS u2,
                  coalesce(g.exposure_level, 0) AS level
           FROM roster_entries r
           JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month
           JOIN exposure_groups g ON g.id = r.exposure_group_id
         ) d
         WHERE d.u < $4::float8 * (1 + $5::float8 * d.level)`,
        [intake!.id, o.salt, outcome.id, o.perRow, o.slope],
      );
      cases += res.rowCount ?? 0;
    }
    await insertBenchReferenceRates(client, [...outcomeIds.values()]);
    await client.query('COMMIT');
    await client.query('ANALYZE case_events');
    return { cases };
  } catch (err) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw err;
  } finally {
    await client.end();
  }
}

/**
 * Writes the benchmark's case list as a case-list intake file (case_ref, worker_key, outcome,
 * onset_date, status), from the cases addBenchCases stored: the file the end-to-end section
 * uploads beside its roster, and pandas reads.
 */
export async function writeBenchCasesCsv(url: string, path: string): Promise<{ cases: number }> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const sql = `COPY (
      SELECT c.case_ref, w.worker_key, o.code AS outcome, to_char(c.onset_date, 'YYYY-MM-DD') AS onset_date, c.status
      FROM case_events c JOIN workers w ON w.id = c.worker_id JOIN outcomes o ON o.id = c.outcome_id
      WHERE c.superseded_by IS NULL ORDER BY c.id
    ) TO STDOUT WITH (FORMAT csv, HEADER true)`;
    await pipeline(client.query(copyTo(sql)), createWriteStream(path));
    const [row] = (await client.query(`SELECT count(*)::int AS n FROM case_events WHERE superseded_by IS NULL`)).rows as Array<{ n: number }>;
    return { cases: row!.n };
  } finally {
    await client.end();
  }
}
