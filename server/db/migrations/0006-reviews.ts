import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/** Review of results: a request to one reviewer for one statement of one version, its verdict and thread. */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await queryInterface.createTable(
      'reviews',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheet_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'worksheets', key: 'id' }, onDelete: 'CASCADE' },
        statement_key: { type: DataTypes.TEXT, allowNull: false },
        statement_text: { type: DataTypes.TEXT, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false },
        fingerprint: { type: DataTypes.STRING(64), allowNull: false },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'requested' },
        requested_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        reviewer_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        requested_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
        decided_at: { type: DataTypes.DATE, allowNull: true },
      },
      { transaction },
    );
    await queryInterface.addIndex('reviews', ['worksheet_id', 'statement_key'], { transaction });
    await queryInterface.addIndex('reviews', ['reviewer_id', 'status'], { transaction });
    await queryInterface.createTable(
      'review_comments',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        review_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'reviews', key: 'id' }, onDelete: 'CASCADE' },
        author_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
        body: { type: DataTypes.TEXT, allowNull: false },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
    await queryInterface.addIndex('review_comments', ['review_id'], { transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.dropTable('review_comments');
  await queryInterface.dropTable('reviews');
};
