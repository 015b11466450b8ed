import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { openTestDataSource } from '../support/test-db';

/**
 * The TypeORM entities (db/src/entities) describe the schema the migrations build: TypeORM's own
 * schema diff between the entities and the migrated database must be empty, so an entity that
 * drifts from its table (a column renamed, a type or nullability changed, a table added in a
 * migration only) fails here rather than at the first query through the entity.
 */
describe('entities against the migrated schema', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openTestDataSource();
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it("TypeORM's schema diff is empty", async () => {
    const diff = await ds.driver.createSchemaBuilder().log();
    expect(diff.upQueries.map((q) => q.query)).toEqual([]);
  });
});
