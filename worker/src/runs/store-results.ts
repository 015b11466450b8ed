import { PassThrough } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import type { EntityManager } from 'typeorm';
import type { Cell } from './cells-query';
import { CELLS_COLUMNS, cellsLines, RESULT_COLUMNS } from './copy-lines';

/** COPY into `table` on the transaction's own connection, fed line by line while the caller works. */
async function openCopy(em: EntityManager, table: string, columns: string[]): Promise<{ write(text: string): void; finish(): Promise<void> }> {
  const client = (await em.queryRunner!.connect()) as PoolClient;
  const source = new PassThrough();
  const done = pipeline(source, client.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN`)));
  done.catch(() => undefined); // surfaced by finish()
  return {
    write: (text) => void source.write(text),
    finish: async () => {
      source.end();
      await done;
    },
  };
}

/**
 * A run's result writer: run_results rows arrive as COPY text (made by the statistics threads,
 * see compute-scopes.ts) and go into one COPY while the threads work, so PostgreSQL stores as
 * the statistics are computed. Everything is inside the run's final transaction, so a failure
 * leaves nothing behind. (The trend test across exposure levels is not stored: the trends page
 * computes it from the results its reader may see.)
 */
export async function openResultWriter(em: EntityManager): Promise<{ lines(text: string): void; finish(): Promise<void> }> {
  const copy = await openCopy(em, 'run_results', ['run_id', ...RESULT_COLUMNS.map(([c]) => c)]);
  return {
    lines: (text) => copy.write(text),
    finish: () => copy.finish(),
  };
}

/** Stores the cells a run aggregated (run_cells, arrays per outcome × group), with one COPY in the run's final transaction. */
export async function storeCells(em: EntityManager, runId: string, cells: Cell[]): Promise<void> {
  const copy = await openCopy(em, 'run_cells', ['run_id', ...CELLS_COLUMNS]);
  copy.write(cellsLines(runId, cells));
  await copy.finish();
}
