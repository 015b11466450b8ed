import type { PoolClient } from 'pg';
import type { DataSource, EntityManager, QueryRunner } from 'typeorm';

/** Runs `fn` in one transaction on one pooled connection (COPY needs the raw client). */
export async function withTransaction<T>(ds: DataSource, fn: (client: PoolClient, em: EntityManager) => Promise<T>): Promise<T> {
  const qr: QueryRunner = ds.createQueryRunner();
  const client = (await qr.connect()) as PoolClient;
  await qr.startTransaction();
  try {
    const result = await fn(client, qr.manager);
    await qr.commitTransaction();
    return result;
  } catch (err) {
    if (qr.isTransactionActive) await qr.rollbackTransaction().catch(() => undefined);
    throw err;
  } finally {
    await qr.release();
  }
}
