import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** A provider webhook event already handled; its unique id makes a replay a no-op. */
export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
  declare id: CreationOptional<number>;
  declare providerEventId: string;
  declare type: string;
  declare outcome: string;
  declare receivedAt: Date;

  static initModel(sequelize: Sequelize): void {
    PaymentEvent.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        providerEventId: { type: DataTypes.STRING(80), allowNull: false, unique: true },
        type: { type: DataTypes.STRING(60), allowNull: false },
        outcome: { type: DataTypes.STRING(60), allowNull: false },
        receivedAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: 'payment_events', modelName: 'PaymentEvent', timestamps: false },
    );
  }
}
