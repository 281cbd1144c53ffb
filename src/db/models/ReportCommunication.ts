import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { CommunicationMethod } from '../../lib/schemas/reports';

/** An urgent finding told directly to a clinician; recorded once (see migrations/…-report-addenda-and-communications.cjs). */
export class ReportCommunication extends Model<InferAttributes<ReportCommunication>, InferCreationAttributes<ReportCommunication>> {
  declare id: CreationOptional<number>;
  declare reportId: number;
  declare ruleId: string | null;
  declare finding: string;
  declare recipientName: string;
  declare recipientRole: string | null;
  declare method: CommunicationMethod;
  declare communicatedAt: Date;
  declare readBack: boolean;
  declare recordedBy: number;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ReportCommunication.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        reportId: { type: DataTypes.INTEGER, allowNull: false },
        ruleId: { type: DataTypes.STRING(60), allowNull: true },
        finding: { type: DataTypes.STRING(500), allowNull: false },
        recipientName: { type: DataTypes.STRING(200), allowNull: false },
        recipientRole: { type: DataTypes.STRING(120), allowNull: true },
        method: { type: DataTypes.ENUM('telephone', 'in-person', 'video-call', 'secure-message'), allowNull: false },
        communicatedAt: { type: DataTypes.DATE, allowNull: false },
        readBack: { type: DataTypes.BOOLEAN, allowNull: false },
        recordedBy: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_communications', modelName: 'ReportCommunication', updatedAt: false },
    );
  }
}
