import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './user.js';

/** One saved state of a worksheet; never changed after it is written. */
export class WorksheetVersion extends Model<InferAttributes<WorksheetVersion>, InferCreationAttributes<WorksheetVersion>> {
  declare id: CreationOptional<number>;
  declare worksheetId: number;
  declare number: number;
  declare title: string;
  declare source: string;
  declare authorId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare author?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    WorksheetVersion.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheetId: { type: DataTypes.INTEGER, allowNull: false },
        number: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.STRING(200), allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false },
        authorId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'worksheet_versions', updatedAt: false },
    );
  }
}
