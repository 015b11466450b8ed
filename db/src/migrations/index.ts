import { Foundation1764633600000 } from './1764633600000-Foundation';

/** Every migration, oldest first. Listed by hand because the TypeORM CLI cannot glob TypeScript under tsx. */
export const migrations = [Foundation1764633600000];
