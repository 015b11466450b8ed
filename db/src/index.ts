export { createDataSource, poolOf } from './data-source';
export { readDbConfig, type DbConfig } from './config';
export { migrate } from './migrate';
export { pgClientOf, rows } from './sql';
export { readSitePeriods } from './reporting-periods';
export * from './entities';
export { seedDemo } from './seed/seed-demo';
export { seedFirstAdministrator, seedNewDatabase } from './seed/first-administrator';
