import { DataSource } from 'typeorm';
import { readDbConfig } from './config';
import { entities } from './entities';
import { migrations } from './migrations';

/** Builds a DataSource for the given connection string (tests pass their own). */
export function createDataSource(url = readDbConfig().DATABASE_URL, poolMax = readDbConfig().DB_POOL_MAX): DataSource {
  return new DataSource({
    type: 'postgres',
    url,
    entities,
    migrations,
    migrationsTableName: 'schema_migrations',
    migrationsTransactionMode: 'each',
    extra: { max: poolMax, connectionTimeoutMillis: 5_000 },
    logging: ['error'],
  });
}

/** The default DataSource, for the TypeORM CLI (`-d db/src/data-source.ts`). */
export const AppDataSource = createDataSource();
