import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SqliteStore } from '../src/store';
import { storeSuite } from './store.suite';

storeSuite('sqlite', async () => {
  const dir = mkdtempSync(join(tmpdir(), 'keelson-store-'));
  return { store: SqliteStore.inDir(dir), cleanup: async () => rmSync(dir, { recursive: true, force: true }) };
});
