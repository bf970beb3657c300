import { DataTypes } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/** Evaluation reports kept per worksheet version, so reopening shows results at once. */
export const up: MigrationFn<MigrationContext> = async ({ context: { queryInterface, sequelize } }) => {
  await sequelize.transaction(async (transaction) => {
    await queryInterface.createTable(
      'evaluations',
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheet_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'worksheets', key: 'id' }, onDelete: 'CASCADE' },
        version: { type: DataTypes.INTEGER, allowNull: false },
        report: { type: DataTypes.JSONB, allowNull: false },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: sequelize.fn('now') },
      },
      { transaction },
    );
    await queryInterface.addIndex('evaluations', ['worksheet_id', 'version'], { unique: true, transaction });
  });
};

export const down: MigrationFn<MigrationContext> = async ({ context: { queryInterface } }) => {
  await queryInterface.dropTable('evaluations');
};
