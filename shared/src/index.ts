export * from './version';
export * from './domain';
