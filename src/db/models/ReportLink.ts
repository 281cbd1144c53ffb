import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A report link e-mailed to a referring clinician (see migrations/…-create-report-links.cjs). */
export class ReportLink extends Model<InferAttributes<ReportLink>, InferCreationAttributes<ReportLink>> {
  declare id: CreationOptional<number>;
  declare reportId: number;
  declare referrerId: number;
  /** sha256 (hex) of the token in the link; the token itself is never stored. */
  declare tokenHash: string;
  declare reason: 'final' | 'addendum';
  declare expiresAt: Date;
  declare firstOpenedAt: CreationOptional<Date | null>;
  declare lastOpenedAt: CreationOptional<Date | null>;
  declare openCount: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ReportLink.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        reportId: { type: DataTypes.INTEGER, allowNull: false },
        referrerId: { type: DataTypes.INTEGER, allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
        reason: { type: DataTypes.ENUM('final', 'addendum'), allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        firstOpenedAt: { type: DataTypes.DATE, allowNull: true },
        lastOpenedAt: { type: DataTypes.DATE, allowNull: true },
        openCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_links', modelName: 'ReportLink', updatedAt: false },
    );
  }
}
