import { Sequelize } from 'sequelize';
import { pgDriver } from './pg-driver.js';

/**
 * The Sequelize instance; its pool reconnects by itself after the database restarts
 * (Sequelize drops a connection that reports an error; see pg-driver.ts for the one
 * moment it cannot).
 */
export function createSequelize(databaseUrl: string): Sequelize {
  const sequelize = new Sequelize(databaseUrl, {
    dialect: 'postgres',
    dialectModule: pgDriver,
    logging: false,
    pool: { max: 10, min: 0, idle: 10_000, acquire: 10_000 },
    define: { underscored: true },
  });
  return sequelize;
}
