import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { PROBE_KIND_CODES, type ProbeKind } from '../../lib/exam-status';
import { REPORT_STATUSES, type ReportStatus } from '../../lib/report-status';
import type { MeasurementSources } from '../../lib/schemas/reports';

/** The structured report of one exam (see migrations/…-create-reports.cjs). */
export class Report extends Model<InferAttributes<Report>, InferCreationAttributes<Report>> {
  declare id: CreationOptional<number>;
  declare examId: ForeignKey<number>;
  declare templateId: string;
  declare templateVersion: string;
  declare referenceSetVersion: string;
  declare status: CreationOptional<ReportStatus>;
  /** As entered: numbers in each field's unit, choice values, "not-measurable" / "not-done". */
  declare measurements: Record<string, number | string>;
  /** Where entered values came from, by field code; a field typed by a person has no entry. */
  declare measurementSources: CreationOptional<MeasurementSources | null>;
  declare nodules: unknown[];
  declare heightCm: number | null;
  declare weightKg: number | null;
  declare probeId: number | null;
  declare probeKind: ProbeKind | null;
  declare evaluation: unknown | null;
  declare findingsText: string | null;
  /** The reading physician's findings and impression: HTML sanitized on the server (src/server/report-text). */
  declare findingsHtml: CreationOptional<string | null>;
  declare impressionHtml: CreationOptional<string | null>;
  /** Who is reading a preliminary report (others see it in the queue and on the report). */
  declare claimedBy: CreationOptional<number | null>;
  declare claimedAt: CreationOptional<Date | null>;
  /** The signature; a trigger keeps a signed report's content and signature unchanged. */
  declare signedBy: CreationOptional<number | null>;
  declare signedAt: CreationOptional<Date | null>;
  declare signedHash: CreationOptional<string | null>;
  declare abnormalCount: CreationOptional<number>;
  declare createdBy: number | null;
  declare updatedBy: number | null;
  declare submittedBy: CreationOptional<number | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Report.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        examId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
        templateId: { type: DataTypes.STRING(40), allowNull: false },
        templateVersion: { type: DataTypes.STRING(20), allowNull: false },
        referenceSetVersion: { type: DataTypes.STRING(80), allowNull: false },
        status: { type: DataTypes.ENUM(...REPORT_STATUSES), allowNull: false, defaultValue: 'draft' },
        measurements: { type: DataTypes.JSON, allowNull: false },
        measurementSources: { type: DataTypes.JSON, allowNull: true },
        nodules: { type: DataTypes.JSON, allowNull: false },
        heightCm: { type: DataTypes.DOUBLE, allowNull: true },
        weightKg: { type: DataTypes.DOUBLE, allowNull: true },
        probeId: { type: DataTypes.INTEGER, allowNull: true },
        probeKind: { type: DataTypes.ENUM(...PROBE_KIND_CODES), allowNull: true },
        evaluation: { type: DataTypes.JSON, allowNull: true },
        findingsText: { type: DataTypes.TEXT, allowNull: true },
        findingsHtml: { type: DataTypes.TEXT, allowNull: true },
        impressionHtml: { type: DataTypes.TEXT, allowNull: true },
        claimedBy: { type: DataTypes.INTEGER, allowNull: true },
        claimedAt: { type: DataTypes.DATE, allowNull: true },
        signedBy: { type: DataTypes.INTEGER, allowNull: true },
        signedAt: { type: DataTypes.DATE(3), allowNull: true },
        signedHash: { type: DataTypes.CHAR(64), allowNull: true },
        abnormalCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        updatedBy: { type: DataTypes.INTEGER, allowNull: true },
        submittedBy: { type: DataTypes.INTEGER, allowNull: true },
        submittedAt: { type: DataTypes.DATE, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'reports', modelName: 'Report' },
    );
  }
}
