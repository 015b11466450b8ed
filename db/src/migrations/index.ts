import { Foundation1764633600000 } from './1764633600000-Foundation';
import { CohortData1764633700000 } from './1764633700000-CohortData';

/** Every migration, oldest first. Listed by hand because the TypeORM CLI cannot glob TypeScript under tsx. */
export const migrations = [Foundation1764633600000, CohortData1764633700000];
