import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { ReviewComment } from './review-comment.js';
import type { User } from './user.js';
import type { Worksheet } from './worksheet.js';

/** One reviewer's review of one statement of one worksheet version. */
export class Review extends Model<InferAttributes<Review>, InferCreationAttributes<Review>> {
  declare id: CreationOptional<number>;
  declare worksheetId: number;
  declare statementKey: string;
  declare statementText: string;
  declare version: number;
  declare fingerprint: string;
  declare status: CreationOptional<'requested' | 'confirmed' | 'disputed'>;
  declare requestedById: number | null;
  declare reviewerId: number | null;
  declare requestedAt: CreationOptional<Date>;
  declare decidedAt: CreationOptional<Date | null>;
  declare reviewer?: NonAttribute<User | null>;
  declare requestedBy?: NonAttribute<User | null>;
  declare worksheet?: NonAttribute<Worksheet>;
  declare comments?: NonAttribute<ReviewComment[]>;

  static initModel(sequelize: Sequelize) {
    Review.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        worksheetId: { type: DataTypes.INTEGER, allowNull: false },
        statementKey: { type: DataTypes.TEXT, allowNull: false },
        statementText: { type: DataTypes.TEXT, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false },
        fingerprint: { type: DataTypes.STRING(64), allowNull: false },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'requested' },
        requestedById: { type: DataTypes.INTEGER, allowNull: true },
        reviewerId: { type: DataTypes.INTEGER, allowNull: true },
        requestedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'reviews', timestamps: false },
    );
  }
}
