import { Sequelize } from 'sequelize';

/** The Sequelize instance; its pool reconnects by itself after the database restarts. */
export function createSequelize(databaseUrl: string): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    logging: false,
    pool: { max: 10, min: 0, idle: 10_000, acquire: 10_000 },
    define: { underscored: true },
  });
}
