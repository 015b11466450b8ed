import { createDataSource } from './data-source';

/** Runs pending migrations and reports what ran. Used by `npm start`, `npm test` and `npm run migrate`. */
export async function migrate(url?: string): Promise<string[]> {
  const ds = createDataSource(url, 2);
  await ds.initialize();
  try {
    const ran = await ds.runMigrations({ transaction: 'each' });
    return ran.map((m) => m.name);
  } finally {
    await ds.destroy();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  migrate()
    .then((ran) => console.log(ran.length ? `migrations applied: ${ran.join(', ')}` : 'database schema is up to date'))
    .catch((err: unknown) => {
      console.error(`migration failed: ${err instanceof Error ? err.message : String(err)}`);
      process.exit(1);
    });
}
