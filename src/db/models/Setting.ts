import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** Clinic-wide settings as key → JSON value (clinic identity, time zone, policies). */
export class Setting extends Model<InferAttributes<Setting>, InferCreationAttributes<Setting>> {
  declare key: string;
  declare value: unknown;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Setting.init(
      {
        key: { type: DataTypes.STRING(80), primaryKey: true },
        value: { type: DataTypes.JSON, allowNull: false },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'settings', modelName: 'Setting', createdAt: false },
    );
  }
}
