import { describe, expect, it } from 'vitest';
import { PostgresStore } from '../src/store';
import { TEST_DATABASE_URL, postgresReachable, testSchema } from './pg';
import { storeSuite } from './store.suite';

// CI (CI=true) starts PostgreSQL before the tests and must run this suite; elsewhere it is skipped,
// with a failing note, only when no server answers.
const reachable = await postgresReachable();

if (reachable) {
  storeSuite('postgres', async () => {
    const { schema, drop } = testSchema();
    return { store: new PostgresStore({ connectionString: TEST_DATABASE_URL, schema }), cleanup: drop };
  });
} else {
  describe('Store contract: postgres', () => {
    it.skipIf(!process.env.CI)(`needs a PostgreSQL server at ${TEST_DATABASE_URL}`, () => {
      expect.fail(`PostgreSQL is not reachable at ${TEST_DATABASE_URL}`);
    });
  });
}
