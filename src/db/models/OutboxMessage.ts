import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** An e-mail waiting to be sent, or sent (see migrations/…-create-outbox.cjs). */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<number>;
  declare kind: string;
  declare dedupeKey: string | null;
  declare examId: number | null;
  /** A report whose PDF goes with the e-mail, rendered when it is sent. */
  declare attachReportId: CreationOptional<number | null>;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare htmlBody: string;
  declare status: CreationOptional<'pending' | 'sent' | 'failed'>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date;
  declare claimedBy: CreationOptional<string | null>;
  declare claimedUntil: CreationOptional<Date | null>;
  declare lastError: CreationOptional<string | null>;
  declare providerMessageId: CreationOptional<string | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    OutboxMessage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        kind: { type: DataTypes.STRING(40), allowNull: false },
        dedupeKey: { type: DataTypes.STRING(100), allowNull: true, unique: true },
        examId: { type: DataTypes.INTEGER, allowNull: true },
        attachReportId: { type: DataTypes.INTEGER, allowNull: true },
        toAddress: { type: DataTypes.STRING(254), allowNull: false },
        subject: { type: DataTypes.STRING(200), allowNull: false },
        textBody: { type: DataTypes.TEXT, allowNull: false },
        htmlBody: { type: DataTypes.TEXT('medium'), allowNull: false },
        status: { type: DataTypes.ENUM('pending', 'sent', 'failed'), allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE, allowNull: false },
        claimedBy: { type: DataTypes.STRING(64), allowNull: true },
        claimedUntil: { type: DataTypes.DATE, allowNull: true },
        lastError: { type: DataTypes.STRING(200), allowNull: true },
        providerMessageId: { type: DataTypes.STRING(200), allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'outbox', modelName: 'OutboxMessage' },
    );
  }
}
