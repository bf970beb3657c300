import type { MigrationFn } from 'umzug';
import { hashPassword } from '../../auth/password.js';
import type { MigrationContext } from '../migrate.js';
import { DEMO_ACCOUNTS, DEMO_GROUP_NAME, DEMO_PASSWORD, DEMO_WORKSHEETS } from './demo-data.js';

/** The fictional demo group, an account per role and a site admin. Runs once. */
export const up: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  const hash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const q = (sql: string, bind: unknown[]) => sequelize.query(sql, { bind, transaction, plain: true }) as Promise<unknown>;
    const ids: Record<string, number> = {};
    for (const account of DEMO_ACCOUNTS) {
      const row = (await q(
        `INSERT INTO users (email, display_name, password_hash, site_role) VALUES ($1, $2, $3, $4)
         ON CONFLICT (email) DO UPDATE SET email = EXCLUDED.email RETURNING id`,
        [account.email, account.displayName, hash, account.siteRole],
      )) as { id: number };
      ids[account.email] = row.id;
    }
    const group = (await q(`INSERT INTO groups (name) VALUES ($1) RETURNING id`, [DEMO_GROUP_NAME])) as { id: number };
    for (const account of DEMO_ACCOUNTS) {
      if (!account.groupRole) continue;
      await q(`INSERT INTO memberships (group_id, user_id, role) VALUES ($1, $2, $3)`, [group.id, ids[account.email], account.groupRole]);
    }
    const author = ids['author@demo.sheetwise.test'];
    for (const sheet of DEMO_WORKSHEETS) {
      const ws = (await q(
        `INSERT INTO worksheets (group_id, title, source, version, updated_by_id) VALUES ($1, $2, $3, 1, $4) RETURNING id`,
        [group.id, sheet.title, sheet.source, author],
      )) as { id: number };
      await q(`INSERT INTO worksheet_versions (worksheet_id, number, title, source, author_id) VALUES ($1, 1, $2, $3, $4)`, [
        ws.id,
        sheet.title,
        sheet.source,
        author,
      ]);
    }
  });
};

export const down: MigrationFn<MigrationContext> = async () => {
  // Demo data is left in place: removing it could take real work with it.
};
