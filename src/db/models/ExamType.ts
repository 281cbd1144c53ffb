import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { PROBE_KIND_CODES, type ProbeKind } from '../../lib/exam-status';

export class ExamType extends Model<InferAttributes<ExamType>, InferCreationAttributes<ExamType>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  /** Which structured template the clinical engine uses (e.g. 'thyroid'). */
  declare templateId: string;
  declare durationMinutes: number;
  declare probeKind: ProbeKind;
  declare preparationText: string;
  declare selfPayPriceCents: number;
  declare depositCents: number;
  declare currency: string;
  declare active: CreationOptional<boolean>;
  /** Optimistic lock: bumped by every catalog edit. */
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ExamType.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: DataTypes.STRING(40), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        templateId: { type: DataTypes.STRING(40), allowNull: false },
        durationMinutes: { type: DataTypes.INTEGER, allowNull: false },
        probeKind: { type: DataTypes.ENUM(...PROBE_KIND_CODES), allowNull: false },
        preparationText: { type: DataTypes.TEXT, allowNull: false },
        selfPayPriceCents: { type: DataTypes.INTEGER, allowNull: false },
        depositCents: { type: DataTypes.INTEGER, allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'exam_types', modelName: 'ExamType' },
    );
  }
}
