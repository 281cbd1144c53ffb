import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export const PROCEDURE_STEP_STATUSES = ['in-progress', 'completed', 'discontinued'] as const;
export type ProcedureStepStatus = (typeof PROCEDURE_STEP_STATUSES)[number];

/** A performed procedure step (DICOM MPPS) a scanner reported for an exam (see migrations/…-dicom-network.cjs). */
export class ProcedureStep extends Model<InferAttributes<ProcedureStep>, InferCreationAttributes<ProcedureStep>> {
  declare id: CreationOptional<number>;
  declare sopInstanceUid: string;
  declare examId: number;
  declare scannerAe: string;
  declare status: ProcedureStepStatus;
  declare startedAt: Date | null;
  declare endedAt: CreationOptional<Date | null>;
  declare discontinuedReason: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ProcedureStep.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        sopInstanceUid: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        examId: { type: DataTypes.INTEGER, allowNull: false },
        scannerAe: { type: DataTypes.STRING(16), allowNull: false },
        status: { type: DataTypes.ENUM(...PROCEDURE_STEP_STATUSES), allowNull: false },
        startedAt: { type: DataTypes.DATE, allowNull: true },
        endedAt: { type: DataTypes.DATE, allowNull: true },
        discontinuedReason: { type: DataTypes.STRING(200), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'procedure_steps', modelName: 'ProcedureStep' },
    );
  }
}
