import type { Readable } from 'node:stream';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { NO_BOUNDS, type CellBounds } from '@ratewarden/shared/intake-cell';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { pumpCopy, stagingRef } from './copy-stage';
import { assertAllRowsStaged } from './csv-record-scan';
import type { CodeMap } from './roster-cell-verdict';
import { ROSTER_STAGE_COLUMNS, RosterStream } from './roster-stream';
import { DEFAULT_TALLY_LIMITS, type TallyLimits } from './roster-tallies';

/**
 * A roster's staging: its typed rows, and beside them one line per worker (birth years and sexes
 * given) and one per site × month (rows, hours). All three are UNLOGGED tables of the intake, kept
 * until apply or discard, so apply need not recompute them.
 */
export interface RosterStage {
  rows: string;
  workers: string;
  slices: string;
}

export function rosterStage(table: string): RosterStage {
  const rows = stagingRef(table);
  return { rows, workers: `${rows}_w`, slices: `${rows}_sl` };
}

/** What the stream found, for the checks in the same transaction. */
export interface RosterStaged {
  rowCount: number;
  problems: IntakeProblem[];
  problemCount: number;
  /** Worker × month duplicates are possible only when some worker's months did not increase. */
  needsDuplicateCheck: boolean;
  siteIds: number[];
  groupIds: number[];
}

async function codeMap(client: PoolClient, table: 'sites' | 'exposure_groups'): Promise<CodeMap> {
  const { rows } = await client.query<{ id: number; code: string }>(`SELECT id, code FROM ${table}`);
  return new Map(rows.map((r) => [r.code.toUpperCase(), r]));
}

async function copyLines(client: PoolClient, sql: string, lines: Iterable<string>): Promise<void> {
  const copy = client.query(copyFrom(sql));
  await new Promise<void>((resolve, reject) => {
    copy.on('finish', resolve).on('error', reject);
    let batch: string[] = [];
    for (const l of lines) {
      batch.push(l);
      if (batch.length === 5000) {
        copy.write(batch.join(''));
        batch = [];
      }
    }
    copy.end(batch.join(''));
  });
}

const nul = (x: number | string) => (typeof x === 'number' ? (Number.isNaN(x) ? '\\N' : String(x)) : x === '' ? '\\N' : x);

/**
 * Creates the three staging tables and streams the upload's data rows through `RosterStream`
 * into the typed one by COPY; then writes the stream's tallies (or, when they outgrew their limits,
 * computes them from the staged rows). Indexes are not needed: every later statement reads the
 * staged rows once, by sequential scan and hash join.
 */
export async function stageRoster(
  client: PoolClient,
  table: string,
  columns: string[],
  delimiter: ',' | ';',
  eol: '\n' | '\r',
  head: Buffer,
  rest: Readable | null,
  limits: TallyLimits = DEFAULT_TALLY_LIMITS,
  bounds: CellBounds = NO_BOUNDS,
): Promise<RosterStaged> {
  const st = rosterStage(table);
  await client.query(`CREATE UNLOGGED TABLE ${st.rows} (line_no bigint NOT NULL, worker_key text, site_id integer, group_id integer, month date,
    hours numeric(7, 2), birth_year smallint, sex text, job_title text)`);
  await client.query(`CREATE UNLOGGED TABLE ${st.workers} (k text NOT NULL, by_min integer, by_max integer, sex_min text, sex_max text)`);
  await client.query(
    `CREATE UNLOGGED TABLE ${st.slices} (site_id integer NOT NULL, site_code text NOT NULL, m text NOT NULL, month date NOT NULL, n bigint NOT NULL, hours numeric NOT NULL)`,
  );
  const stream = new RosterStream(
    columns,
    delimiter,
    eol,
    { site: await codeMap(client, 'sites'), exposure_group: await codeMap(client, 'exposure_groups') },
    2,
    limits,
    bounds,
  );
  if (rest) {
    const staged = await pumpCopy(client, `COPY ${st.rows} (${ROSTER_STAGE_COLUMNS.join(', ')}) FROM STDIN`, head, rest, stream);
    assertAllRowsStaged(stream.rows, staged);
  }

  if (stream.tallies.overflow) {
    await client.query(
      `INSERT INTO ${st.workers} SELECT worker_key, min(birth_year), max(birth_year), min(sex), max(sex) FROM ${st.rows} WHERE worker_key IS NOT NULL GROUP BY 1`,
    );
    await client.query(`
      INSERT INTO ${st.slices} SELECT s.site_id, upper(si.code), to_char(s.month, 'YYYY-MM'), s.month, count(*), coalesce(sum(s.hours), 0)
      FROM ${st.rows} s JOIN sites si ON si.id = s.site_id WHERE s.month IS NOT NULL GROUP BY s.site_id, si.code, s.month`);
  } else {
    if (stream.tallies.workers.size) {
      await copyLines(
        client,
        `COPY ${st.workers} FROM STDIN`,
        (function* () {
          for (const [k, t] of stream.tallies.workers) yield `${k}\t${nul(t.byMin)}\t${nul(t.byMax)}\t${nul(t.sexMin)}\t${nul(t.sexMax)}\n`;
        })(),
      );
    }
    if (stream.tallies.slices.size) {
      await copyLines(
        client,
        `COPY ${st.slices} FROM STDIN`,
        (function* () {
          for (const t of stream.tallies.slices.values())
            yield `${t.siteId}\t${t.siteCode}\t${t.month}\t${t.month}-01\t${t.n}\t${(t.cents / 100).toFixed(2)}\n`;
        })(),
      );
    }
  }
  // The staged tables are new: without statistics the planner would guess their sizes.
  await client.query(`ANALYZE ${st.workers}, ${st.slices}`);
  return {
    rowCount: stream.rows,
    problems: stream.problems,
    problemCount: stream.problemCount,
    needsDuplicateCheck: stream.tallies.overflow || !stream.tallies.monthsIncrease,
    siteIds: [...stream.siteIds],
    groupIds: [...stream.groupIds],
  };
}
