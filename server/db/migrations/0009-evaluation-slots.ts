import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * Running and queued evaluations per owner (an account or a referee link), shared by all
 * server processes on this database: the per-owner cap is counted here. A row lives while
 * its evaluation does; the process that holds it renews `expires_at`, so the rows of a
 * process that died expire on their own.
 */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await queryInterface.createTable(
      'evaluation_slots',
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        owner: { type: DataTypes.STRING(64), allowNull: false },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
        expires_at: { type: DataTypes.DATE, allowNull: false },
      },
      { transaction },
    );
    await queryInterface.addIndex('evaluation_slots', ['owner', 'expires_at'], { transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.dropTable('evaluation_slots');
};
