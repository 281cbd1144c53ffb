import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export const PAYMENT_KINDS = ['deposit', 'balance', 'refund'] as const;
export type PaymentKind = (typeof PAYMENT_KINDS)[number];
export const PAYMENT_STATUSES = ['pending', 'succeeded', 'failed', 'canceled'] as const;
export type PaymentStatus = (typeof PAYMENT_STATUSES)[number];

/** One movement of money for an exam: a deposit, a balance or a refund (integer cents). */
export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
  declare id: CreationOptional<number>;
  declare examId: ForeignKey<number>;
  declare kind: PaymentKind;
  declare amountCents: number;
  declare currency: string;
  declare status: CreationOptional<PaymentStatus>;
  declare idempotencyKey: string;
  declare paymentMethod: string | null;
  declare providerIntentId: string | null;
  declare providerRefundId: string | null;
  declare refundOfId: number | null;
  declare failureCode: string | null;
  declare failureMessage: string | null;
  declare attempts: CreationOptional<number>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Payment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        examId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.ENUM(...PAYMENT_KINDS), allowNull: false },
        amountCents: { type: DataTypes.INTEGER, allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        status: { type: DataTypes.ENUM(...PAYMENT_STATUSES), allowNull: false, defaultValue: 'pending' },
        idempotencyKey: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        paymentMethod: { type: DataTypes.STRING(80), allowNull: true },
        providerIntentId: { type: DataTypes.STRING(80), allowNull: true },
        providerRefundId: { type: DataTypes.STRING(80), allowNull: true },
        refundOfId: { type: DataTypes.INTEGER, allowNull: true },
        failureCode: { type: DataTypes.STRING(60), allowNull: true },
        failureMessage: { type: DataTypes.STRING(300), allowNull: true },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'payments', modelName: 'Payment' },
    );
  }
}
