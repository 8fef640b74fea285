import type { Config } from '../config';
import { PostgresStore } from './postgres';
import { SqliteStore } from './sqlite';
import type { Store } from './types';

/** PostgreSQL when a database URL is configured, else the embedded SQLite file in the data folder; migrated. */
export async function openStore(cfg: Config): Promise<Store> {
  const store = cfg.databaseUrl
    ? new PostgresStore({ connectionString: cfg.databaseUrl, schema: cfg.databaseSchema })
    : SqliteStore.inDir(cfg.dataDir);
  try {
    await store.migrate();
  } catch (e) {
    await store.close().catch(() => {});
    throw e;
  }
  return store;
}
