import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { SiteRole, UserDto } from '../../shared/api.js';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare displayName: string;
  declare passwordHash: string;
  declare siteRole: CreationOptional<SiteRole>;
  declare disabled: CreationOptional<boolean>;
  declare failedSignIns: CreationOptional<number>;
  declare lockedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  toDto(): UserDto {
    return { id: this.id, email: this.email, displayName: this.displayName, siteRole: this.siteRole, disabled: this.disabled };
  }

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
        displayName: { type: DataTypes.STRING(80), allowNull: false },
        passwordHash: { type: DataTypes.STRING(100), allowNull: false },
        siteRole: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'user' },
        disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        failedSignIns: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        lockedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users' },
    );
  }
}
