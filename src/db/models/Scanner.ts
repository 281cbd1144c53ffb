import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class Scanner extends Model<InferAttributes<Scanner>, InferCreationAttributes<Scanner>> {
  declare id: CreationOptional<number>;
  declare roomId: ForeignKey<number>;
  declare name: string;
  /** DICOM application entity title: up to 16 characters, no backslash or control characters. */
  declare aeTitle: string;
  declare active: CreationOptional<boolean>;
  /** Optimistic lock: bumped by every catalog edit. */
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Scanner.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        roomId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(80), allowNull: false },
        aeTitle: { type: DataTypes.STRING(16), allowNull: false, unique: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'scanners', modelName: 'Scanner' },
    );
  }
}
