import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * Sign-in back-off kept in the database, so that every server process sees the same
 * counts: failures per account, per client address, and per account and address; and
 * the addresses each account signed in from (those are not held back by the account's
 * own back-off, so a stranger cannot keep the owner out).
 */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await queryInterface.createTable(
      'sign_in_throttle',
      {
        scope: { type: DataTypes.STRING(16), allowNull: false, primaryKey: true },
        key: { type: DataTypes.STRING(400), allowNull: false, primaryKey: true },
        failures: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        last_failed_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
    await queryInterface.addIndex('sign_in_throttle', ['last_failed_at'], { transaction });
    await queryInterface.createTable(
      'sign_in_addresses',
      {
        user_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
        address: { type: DataTypes.STRING(64), allowNull: false, primaryKey: true },
        last_signed_in_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
    // Role changes lock a group's memberships; reset links are looked up per account.
    await queryInterface.addIndex('password_resets', ['user_id'], { transaction });
    // The old lock (until the mailed link) becomes back-off: nobody stays locked by it.
    await queryInterface.bulkUpdate('users', { locked_at: null, failed_sign_ins: 0 }, {}, { transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.removeIndex('password_resets', ['user_id']);
  await queryInterface.dropTable('sign_in_addresses');
  await queryInterface.dropTable('sign_in_throttle');
};
