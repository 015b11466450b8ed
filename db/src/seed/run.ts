import { createDataSource } from '../data-source';
import { seedDemo } from './seed-demo';

/** `npm run seed -w db`: loads the demo scenario when the database is empty. */
const ds = createDataSource(undefined, 2);
await ds.initialize();
try {
  console.log((await seedDemo(ds)) ? 'demo scenario loaded' : 'database already holds data; demo not loaded');
} finally {
  await ds.destroy();
}
