import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './user.js';

/** The current state of a worksheet; every save also writes a WorksheetVersion. */
export class Worksheet extends Model<InferAttributes<Worksheet>, InferCreationAttributes<Worksheet>> {
  declare id: CreationOptional<number>;
  declare groupId: number;
  declare title: string;
  declare source: string;
  declare version: CreationOptional<number>;
  declare updatedById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare updatedBy?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    Worksheet.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        groupId: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.STRING(200), allowNull: false },
        source: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        updatedById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'worksheets' },
    );
  }
}
