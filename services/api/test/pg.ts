import { randomBytes } from 'node:crypto';
import pg from 'pg';

/**
 * The PostgreSQL server of the dev machines and CI (trust auth, database `test`), or
 * KEELSON_TEST_DATABASE_URL. Each test file works in a schema of its own, dropped afterwards.
 */
export const TEST_DATABASE_URL = process.env.KEELSON_TEST_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/test';

export async function postgresReachable(): Promise<boolean> {
  const c = new pg.Client({ connectionString: TEST_DATABASE_URL, connectionTimeoutMillis: 2000 });
  try {
    await c.connect();
    await c.query('SELECT 1');
    return true;
  } catch {
    return false;
  } finally {
    await c.end().catch(() => {});
  }
}

export function testSchema(): { schema: string; drop: () => Promise<void> } {
  const schema = `keelson_test_${randomBytes(6).toString('hex')}`;
  return {
    schema,
    drop: async () => {
      const c = new pg.Client({ connectionString: TEST_DATABASE_URL });
      await c.connect();
      try {
        await c.query(`DROP SCHEMA IF EXISTS "${schema}" CASCADE`);
      } finally {
        await c.end();
      }
    },
  };
}
