import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/**
 * Who did what, when. `detail` holds identifiers and changed field names/values that are not
 * patient-identifying; never names, birth dates or report text.
 */
export class AuditEvent extends Model<
  InferAttributes<AuditEvent>,
  InferCreationAttributes<AuditEvent>
> {
  declare id: CreationOptional<number>;
  declare at: CreationOptional<Date>;
  declare actorUserId: number | null;
  declare action: string;
  declare entityType: string;
  declare entityId: string | null;
  declare detail: Record<string, unknown> | null;
  declare requestId: string | null;

  static initModel(sequelize: Sequelize): void {
    AuditEvent.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
        actorUserId: { type: DataTypes.INTEGER, allowNull: true },
        action: { type: DataTypes.STRING(64), allowNull: false },
        entityType: { type: DataTypes.STRING(40), allowNull: false },
        entityId: { type: DataTypes.STRING(64), allowNull: true },
        detail: { type: DataTypes.JSON, allowNull: true },
        requestId: { type: DataTypes.STRING(64), allowNull: true },
      },
      { sequelize, tableName: 'audit_events', modelName: 'AuditEvent', timestamps: false },
    );
  }
}
