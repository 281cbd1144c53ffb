import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A signed addendum to a final report; written once (see migrations/…-report-addenda-and-communications.cjs). */
export class ReportAddendum extends Model<InferAttributes<ReportAddendum>, InferCreationAttributes<ReportAddendum>> {
  declare id: CreationOptional<number>;
  declare reportId: number;
  /** Sanitized HTML (headings, lists, bold). */
  declare bodyHtml: string;
  declare signedBy: number;
  declare signedAt: Date;
  declare signedHash: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ReportAddendum.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        reportId: { type: DataTypes.INTEGER, allowNull: false },
        bodyHtml: { type: DataTypes.TEXT, allowNull: false },
        signedBy: { type: DataTypes.INTEGER, allowNull: false },
        signedAt: { type: DataTypes.DATE(3), allowNull: false },
        signedHash: { type: DataTypes.CHAR(64), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_addenda', modelName: 'ReportAddendum', updatedAt: false },
    );
  }
}
