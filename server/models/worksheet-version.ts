import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './user.js';

export type VersionKind = 'created' | 'saved' | 'auto' | 'restored';

/** One checkpoint of a worksheet; its text never changes after it is written (only a milestone sign-off is added). */
export class WorksheetVersion extends Model<InferAttributes<WorksheetVersion>, InferCreationAttributes<WorksheetVersion>> {
  declare id: CreationOptional<number>;
  declare worksheetId: number;
  declare number: number;
  declare title: string;
  declare source: string;
  declare authorId: number | null;
  /** An optional name given when the checkpoint was made. */
  declare name: CreationOptional<string | null>;
  /** How the version came about: the first one, an explicit save, the automatic one (at most one per ten minutes of editing), a restore. */
  declare kind: CreationOptional<VersionKind>;
  /** Signed off as a milestone (every result confirmed by a review) at this time, by this person. */
  declare milestoneAt: CreationOptional<Date | null>;
  declare milestoneById: CreationOptional<number | null>;
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
        name: { type: DataTypes.STRING(120), allowNull: true },
        kind: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'saved' },
        milestoneAt: { type: DataTypes.DATE, allowNull: true },
        milestoneById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'worksheet_versions', updatedAt: false },
    );
  }
}
