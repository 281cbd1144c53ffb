import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** A named counter (see migrations/…-create-sequences.cjs). */
export class Sequence extends Model<InferAttributes<Sequence>, InferCreationAttributes<Sequence>> {
  declare name: string;
  declare lastValue: number;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Sequence.init(
      {
        name: { type: DataTypes.STRING(60), primaryKey: true },
        lastValue: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'sequences', modelName: 'Sequence', createdAt: false },
    );
  }
}
