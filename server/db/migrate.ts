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
    storage: new SequelizeStorage({ sequelize, tableName }),
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
  const done = await umzugFor(sequelize, 'seeders', 'schema_seeds').up();
  return done.map((m) => m.name);
}
