import { DataSource } from 'typeorm';
import { readDbConfig } from './config';
import { entities } from './entities';
import { migrations } from './migrations';

/** Builds a DataSource for the given connection string (tests pass their own). */
export function createDataSource(
  url = readDbConfig().DATABASE_URL,
  poolMax = readDbConfig().DB_POOL_MAX,
  poolWaitMs = readDbConfig().DB_POOL_WAIT_MS,
): DataSource {
  return new DataSource({
    type: 'postgres',
    url,
    entities,
    migrations,
    migrationsTableName: 'schema_migrations',
    migrationsTransactionMode: 'each',
    extra: { max: poolMax, connectionTimeoutMillis: poolWaitMs },
    logging: ['error'],
  });
}

/** The default DataSource, for the TypeORM CLI (`-d db/src/data-source.ts`). */
export const AppDataSource = createDataSource();

/** The pg pool behind a DataSource, for its queue length (TypeORM keeps it as the driver's `master`). */
export function poolOf(ds: DataSource): { waitingCount: number; totalCount: number; idleCount: number } | null {
  const pool = (ds.driver as unknown as { master?: { waitingCount: number; totalCount: number; idleCount: number } }).master;
  return pool && typeof pool.waitingCount === 'number' ? pool : null;
}
