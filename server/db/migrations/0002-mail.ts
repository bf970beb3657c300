import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * mail_messages: every mail the product sends, with its delivery state (retried,
 * failures visible to the admin). captured_mail: what the local fake SMTP server
 * received in development and tests.
 */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await queryInterface.createTable(
      'mail_messages',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        to_address: { type: DataTypes.STRING(254), allowNull: false },
        subject: { type: DataTypes.STRING(300), allowNull: false },
        text: { type: DataTypes.TEXT, allowNull: false },
        html: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        last_error: { type: DataTypes.TEXT, allowNull: true },
        next_attempt_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
        sent_at: { type: DataTypes.DATE, allowNull: true },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
    await queryInterface.addIndex('mail_messages', ['status', 'next_attempt_at'], { transaction });
    await queryInterface.createTable(
      'captured_mail',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        from_address: { type: DataTypes.TEXT, allowNull: true },
        to_address: { type: DataTypes.TEXT, allowNull: false },
        subject: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        text: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        html: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        received_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.dropTable('captured_mail');
  await queryInterface.dropTable('mail_messages');
};
