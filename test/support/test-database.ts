import { randomBytes } from 'node:crypto';
import pg from 'pg';

/**
 * The test cluster started by `npm test` (scripts/test.mjs exports its address).
 * Each test file gets a database of its own, so files can run in any order.
 */
export function testClusterUrl(): string {
  const url = process.env['SHEETWISE_TEST_PG'];
  if (!url) throw new Error('SHEETWISE_TEST_PG is not set: run the tests with `npm test`, which starts the test database.');
  return url;
}

export async function createTestDatabase(prefix = 't'): Promise<{ url: string; name: string; drop: () => Promise<void> }> {
  const base = testClusterUrl();
  const name = `sheetwise_${prefix}_${randomBytes(5).toString('hex')}`;
  const admin = new pg.Client({ connectionString: `${base}/postgres` });
  await admin.connect();
  await admin.query(`CREATE DATABASE "${name}"`);
  await admin.end();
  return {
    name,
    url: `${base}/${name}`,
    drop: async () => {
      const c = new pg.Client({ connectionString: `${base}/postgres` });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
      await c.end();
    },
  };
}
