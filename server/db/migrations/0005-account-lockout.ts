import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/** Consecutive failed sign-ins per account, the lock they cause, and unlock links. */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await queryInterface.addColumn('users', 'failed_sign_ins', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 }, { transaction });
    await queryInterface.addColumn('users', 'locked_at', { type: DataTypes.DATE, allowNull: true }, { transaction });
    await queryInterface.createTable(
      'account_unlocks',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
        token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        expires_at: { type: DataTypes.DATE, allowNull: false },
        used_at: { type: DataTypes.DATE, allowNull: true },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.dropTable('account_unlocks');
  await queryInterface.removeColumn('users', 'locked_at');
  await queryInterface.removeColumn('users', 'failed_sign_ins');
};
