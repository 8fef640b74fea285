export * from './types';
export { SqliteStore } from './sqlite';
export { PostgresStore, type PostgresOptions } from './postgres';
export { openStore } from './open';
