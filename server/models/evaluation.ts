import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { WorksheetReport } from '../../shared/evaluation.js';

/** The evaluation report of one worksheet version; written once per version. */
export class Evaluation extends Model<InferAttributes<Evaluation>, InferCreationAttributes<Evaluation>> {
  declare id: CreationOptional<number>;
  declare worksheetId: number;
  declare version: number;
  declare report: WorksheetReport;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Evaluation.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheetId: { type: DataTypes.INTEGER, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false },
        report: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'evaluations', updatedAt: false },
    );
  }
}
