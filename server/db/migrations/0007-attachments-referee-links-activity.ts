import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/** Supporting files of a worksheet, read-only referee links to one version, and a group's activity. */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    const now = { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') };
    await queryInterface.createTable(
      'attachments',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheet_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'worksheets', key: 'id' }, onDelete: 'CASCADE' },
        file_name: { type: DataTypes.STRING(255), allowNull: false },
        media_type: { type: DataTypes.STRING(100), allowNull: false },
        size: { type: DataTypes.INTEGER, allowNull: false },
        content: { type: DataTypes.BLOB, allowNull: false },
        uploaded_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        created_at: now,
      },
      { transaction },
    );
    await queryInterface.addIndex('attachments', ['worksheet_id'], { transaction });
    await queryInterface.createTable(
      'referee_links',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheet_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'worksheets', key: 'id' }, onDelete: 'CASCADE' },
        version: { type: DataTypes.INTEGER, allowNull: false },
        token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        created_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        expires_at: { type: DataTypes.DATE, allowNull: false },
        revoked_at: { type: DataTypes.DATE, allowNull: true },
        created_at: now,
      },
      { transaction },
    );
    await queryInterface.createTable(
      'activity',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        group_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'groups', key: 'id' }, onDelete: 'CASCADE' },
        user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        action: { type: DataTypes.STRING(40), allowNull: false },
        subject: { type: DataTypes.TEXT, allowNull: false },
        worksheet_id: { type: DataTypes.INTEGER, allowNull: true },
        created_at: now,
      },
      { transaction },
    );
    await queryInterface.addIndex('activity', ['group_id', 'created_at'], { transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.dropTable('activity');
  await queryInterface.dropTable('referee_links');
  await queryInterface.dropTable('attachments');
};
