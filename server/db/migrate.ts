import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';

const here = dirname(fileURLToPath(import.meta.url));

export type MigrationContext = { queryInterface: QueryInterface; sequelize: Sequelize };

function umzugFor(sequelize: Sequelize, folder: 'migrations' | 'seeders', tableName: string) {
  return new Umzug<MigrationContext>({
    migrations: { glob: ['[0-9]*.ts', { cwd: join(here, folder) }] },
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    // A model name of its own per table: with the default name both storages would share one model.
    storage: new SequelizeStorage({ sequelize, tableName, modelName: `umzug_${tableName}` }),
    logger: undefined,
  });
}

/** Applies pending migrations (never drops data; each migration is its own transaction). */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await umzugFor(sequelize, 'migrations', 'schema_migrations').up();
  return done.map((m) => m.name);
}

/** Seeds the demo data once: a seeder that ran is recorded and never runs again. */
export async function seedDemo(sequelize: Sequelize): Promise<string[]> {
  // Databases made before seeds had a table of their own recorded them with the migrations.
  await sequelize.query(`CREATE TABLE IF NOT EXISTS schema_seeds (name varchar(255) PRIMARY KEY)`);
  await sequelize.query(
    `INSERT INTO schema_seeds (name) SELECT name FROM schema_migrations WHERE name LIKE '%demo%' ON CONFLICT DO NOTHING`,
  );
  const done = await umzugFor(sequelize, 'seeders', 'schema_seeds').up();
  return done.map((m) => m.name);
}
