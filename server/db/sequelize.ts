import { Sequelize } from 'sequelize';

/** The Sequelize instance; its pool reconnects by itself after the database restarts. */
export function createSequelize(databaseUrl: string): Sequelize {
  const sequelize = new Sequelize(databaseUrl, {
    dialect: 'postgres',
    logging: false,
    pool: { max: 10, min: 0, idle: 10_000, acquire: 10_000 },
    define: { underscored: true },
  });
  // An idle connection that the database drops (a restart) emits 'error'; without a
  // listener that would end the process. The pool replaces it on the next query.
  sequelize.addHook('afterConnect', (connection) => {
    (connection as { on?: (event: string, fn: (err: Error) => void) => void }).on?.('error', () => {});
  });
  return sequelize;
}
