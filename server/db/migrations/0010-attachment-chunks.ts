import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * Attached files in chunks of at most 256 kB (`attachment_chunks`), so an upload is
 * written and a download read a chunk at a time and no server process holds a whole
 * file. Files stored whole in `attachments.content` are cut into chunks and the column
 * is dropped.
 */
const CHUNK_BYTES = 256 * 1024;

export const up: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `CREATE TABLE attachment_chunks (
         attachment_id integer NOT NULL REFERENCES attachments(id) ON DELETE CASCADE,
         seq integer NOT NULL,
         data bytea NOT NULL,
         PRIMARY KEY (attachment_id, seq)
       )`,
      { transaction },
    );
    await sequelize.query(
      `INSERT INTO attachment_chunks (attachment_id, seq, data)
       SELECT a.id, g.seq, substring(a.content FROM g.seq * ${CHUNK_BYTES} + 1 FOR ${CHUNK_BYTES})
       FROM attachments a, generate_series(0, ceil(octet_length(a.content) / ${CHUNK_BYTES}.0)::int - 1) AS g(seq)`,
      { transaction },
    );
    await sequelize.query('ALTER TABLE attachments DROP COLUMN content', { transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(`ALTER TABLE attachments ADD COLUMN content bytea NOT NULL DEFAULT ''::bytea`, { transaction });
    await sequelize.query(
      `UPDATE attachments a SET content = c.data
       FROM (SELECT attachment_id, string_agg(data, ''::bytea ORDER BY seq) AS data FROM attachment_chunks GROUP BY attachment_id) c
       WHERE c.attachment_id = a.id`,
      { transaction },
    );
    await sequelize.query('ALTER TABLE attachments ALTER COLUMN content DROP DEFAULT', { transaction });
    await sequelize.query('DROP TABLE attachment_chunks', { transaction });
  });
};
