import type { PoolClient } from 'pg';
import type { DataSource, EntityManager } from 'typeorm';

/**
 * Runs SQL and always returns the rows. TypeORM's postgres driver answers UPDATE and DELETE with
 * `[rows, rowCount]` but SELECT and INSERT with the rows alone; this evens that out.
 */
export async function rows<T>(db: DataSource | EntityManager, text: string, params: unknown[] = []): Promise<T[]> {
  const result: unknown = await db.query(text, params);
  if (Array.isArray(result) && result.length === 2 && Array.isArray(result[0]) && typeof result[1] === 'number') return result[0] as T[];
  return result as T[];
}

/**
 * The node-postgres client under a TypeORM transaction: the same connection and transaction, for
 * what needs the driver itself (COPY streams, typed `client.query`). Use it inside
 * `ds.transaction(async (em) => ...)`.
 */
export async function pgClientOf(em: EntityManager): Promise<PoolClient> {
  return (await em.queryRunner!.connect()) as PoolClient;
}
