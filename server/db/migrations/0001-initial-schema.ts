import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/** Accounts, groups with member roles, worksheets with their versions, and sessions. */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    const timestamps = {
      created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
    };
    await queryInterface.createTable(
      'users',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
        display_name: { type: DataTypes.STRING(80), allowNull: false },
        password_hash: { type: DataTypes.STRING(100), allowNull: false },
        site_role: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'user' },
        disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...timestamps,
      },
      { transaction },
    );
    await queryInterface.createTable(
      'groups',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        ...timestamps,
      },
      { transaction },
    );
    await queryInterface.createTable(
      'memberships',
      {
        group_id: {
          type: DataTypes.INTEGER,
          primaryKey: true,
          references: { model: 'groups', key: 'id' },
          onDelete: 'CASCADE',
        },
        user_id: {
          type: DataTypes.INTEGER,
          primaryKey: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'CASCADE',
        },
        role: { type: DataTypes.STRING(16), allowNull: false },
        ...timestamps,
      },
      { transaction },
    );
    await queryInterface.addIndex('memberships', ['user_id'], { transaction });
    await queryInterface.createTable(
      'worksheets',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        group_id: {
          type: DataTypes.INTEGER,
          allowNull: false,
          references: { model: 'groups', key: 'id' },
          onDelete: 'CASCADE',
        },
        title: { type: DataTypes.STRING(200), allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        updated_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        ...timestamps,
      },
      { transaction },
    );
    await queryInterface.addIndex('worksheets', ['group_id'], { transaction });
    await queryInterface.createTable(
      'worksheet_versions',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheet_id: {
          type: DataTypes.INTEGER,
          allowNull: false,
          references: { model: 'worksheets', key: 'id' },
          onDelete: 'CASCADE',
        },
        number: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.STRING(200), allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false },
        author_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
    // The version numbers of a worksheet have no duplicates, whatever races happen.
    await queryInterface.addIndex('worksheet_versions', ['worksheet_id', 'number'], { unique: true, transaction });
    // The session store's table (the layout connect-pg-simple expects).
    await queryInterface.createTable(
      'session',
      {
        sid: { type: DataTypes.STRING, primaryKey: true },
        sess: { type: DataTypes.JSON, allowNull: false },
        expire: { type: DataTypes.DATE, allowNull: false },
      },
      { transaction },
    );
    await queryInterface.addIndex('session', ['expire'], { name: 'IDX_session_expire', transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  for (const table of ['session', 'worksheet_versions', 'worksheets', 'memberships', 'groups', 'users']) {
    await queryInterface.dropTable(table);
  }
};
