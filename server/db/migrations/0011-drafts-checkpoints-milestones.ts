import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * Drafts and checkpoints. Autosave writes the caller's draft (`worksheet_drafts`, one row
 * per worksheet and person, kept in PostgreSQL so every server process and every browser
 * of that person sees it); a version is a checkpoint: an explicit save ('saved'), at most
 * one automatic version per ten minutes of editing ('auto'), the first one ('created'),
 * or a restore ('restored'), with an optional name. A version can be signed off as a
 * milestone (`milestone_at`, `milestone_by_id`) once every result in it is confirmed.
 * Versions written before this migration were made by the old autosave: they are 'saved'.
 */
export const up: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `ALTER TABLE worksheet_versions
         ADD COLUMN name varchar(120),
         ADD COLUMN kind varchar(16) NOT NULL DEFAULT 'saved' CHECK (kind IN ('created', 'saved', 'auto', 'restored')),
         ADD COLUMN milestone_at timestamptz,
         ADD COLUMN milestone_by_id integer REFERENCES users(id) ON DELETE SET NULL`,
      { transaction },
    );
    await sequelize.query(`UPDATE worksheet_versions SET kind = 'created' WHERE number = 1`, { transaction });
    await sequelize.query(
      `CREATE TABLE worksheet_drafts (
         worksheet_id integer NOT NULL REFERENCES worksheets(id) ON DELETE CASCADE,
         user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
         title varchar(200) NOT NULL,
         source text NOT NULL,
         base_version integer NOT NULL,
         started_at timestamptz NOT NULL DEFAULT now(),
         updated_at timestamptz NOT NULL DEFAULT now(),
         PRIMARY KEY (worksheet_id, user_id)
       )`,
      { transaction },
    );
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('DROP TABLE worksheet_drafts', { transaction });
    await sequelize.query(
      'ALTER TABLE worksheet_versions DROP COLUMN milestone_by_id, DROP COLUMN milestone_at, DROP COLUMN kind, DROP COLUMN name',
      { transaction },
    );
  });
};
