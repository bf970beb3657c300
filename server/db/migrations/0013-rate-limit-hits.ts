import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * Fixed-window request counters for the rate limits on registration, password resets and
 * invitations (middleware/shared-rate-limit.ts), kept here so that every server process
 * behind the proxy counts against the same limit. One row per limiter and client key.
 */
export const up: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.query(`
    CREATE TABLE rate_limit_hits (
      key text PRIMARY KEY,
      hits integer NOT NULL,
      reset_at timestamptz NOT NULL
    )`);
  await sequelize.query('CREATE INDEX rate_limit_hits_reset_at ON rate_limit_hits (reset_at)');
};

export const down: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP TABLE rate_limit_hits');
};
