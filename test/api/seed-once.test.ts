// A second start reuses the data: migrations and the demo seed run once per database.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { migrate, seedDemo } from '../../server/db/migrate.js';
import { startTestServer } from '../support/test-server.js';

test('migrating and seeding again changes nothing', async () => {
  const server = await startTestServer();
  try {
    const { sequelize } = server.running;
    const count = async () => {
      const [rows] = await sequelize.query('SELECT (SELECT count(*) FROM users)::int AS u, (SELECT count(*) FROM groups)::int AS g, (SELECT count(*) FROM worksheets)::int AS w');
      return rows[0];
    };
    const before = await count();
    assert.deepEqual(await migrate(sequelize), []);
    assert.deepEqual(await seedDemo(sequelize), []);
    assert.deepEqual(await count(), before);
    const [seeds] = await sequelize.query('SELECT name FROM schema_seeds');
    assert.deepEqual(seeds, [{ name: '0001-demo-group.ts' }]);
  } finally {
    await server.stop();
  }
});
