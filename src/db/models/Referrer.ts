import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class Referrer extends Model<InferAttributes<Referrer>, InferCreationAttributes<Referrer>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare practice: string;
  declare email: string;
  declare phone: string | null;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Referrer.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        practice: { type: DataTypes.STRING(160), allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
        phone: { type: DataTypes.STRING(40), allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'referrers', modelName: 'Referrer' },
    );
  }
}
