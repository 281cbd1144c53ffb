import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export const SCANNER_VALUE_STATES = ['offered', 'accepted', 'rejected'] as const;
export type ScannerValueState = (typeof SCANNER_VALUE_STATES)[number];

/**
 * One measurement read from a scanner's structured report and mapped to a template field,
 * offered to the sonographer until accepted or rejected (see migrations/…-dicom-network.cjs).
 */
export class ScannerValue extends Model<InferAttributes<ScannerValue>, InferCreationAttributes<ScannerValue>> {
  declare id: CreationOptional<number>;
  declare examId: number;
  declare attachmentId: number;
  declare fieldCode: string;
  /** In the template field's unit. */
  declare value: number;
  declare concept: string;
  declare conceptMeaning: string;
  declare sourceValue: string;
  declare sourceUnit: string;
  declare state: CreationOptional<ScannerValueState>;
  declare decidedBy: CreationOptional<number | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ScannerValue.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        examId: { type: DataTypes.INTEGER, allowNull: false },
        attachmentId: { type: DataTypes.INTEGER, allowNull: false },
        fieldCode: { type: DataTypes.STRING(60), allowNull: false },
        value: { type: DataTypes.DOUBLE, allowNull: false },
        concept: { type: DataTypes.STRING(80), allowNull: false },
        conceptMeaning: { type: DataTypes.STRING(120), allowNull: false },
        sourceValue: { type: DataTypes.STRING(40), allowNull: false },
        sourceUnit: { type: DataTypes.STRING(40), allowNull: false },
        state: { type: DataTypes.ENUM(...SCANNER_VALUE_STATES), allowNull: false, defaultValue: 'offered' },
        decidedBy: { type: DataTypes.INTEGER, allowNull: true },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'scanner_values', modelName: 'ScannerValue' },
    );
  }
}
