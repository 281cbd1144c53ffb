import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** One stored reference-range row (the clinical engine's ReferenceRange, plus its set). */
export class ReferenceRangeRow extends Model<InferAttributes<ReferenceRangeRow>, InferCreationAttributes<ReferenceRangeRow>> {
  declare id: CreationOptional<number>;
  declare referenceSet: string;
  declare rowKey: string;
  declare code: string;
  declare label: string;
  declare sex: 'male' | 'female' | 'any';
  declare ageMinYears: number | null;
  declare ageMaxYears: number | null;
  declare unit: string;
  declare decimals: number;
  declare normalMin: number | null;
  declare normalMax: number | null;
  declare severityDirection: 'low' | 'high' | null;
  declare mildLimit: number | null;
  declare moderateLimit: number | null;
  declare source: string;
  declare provenance: 'SRC+' | 'SRC~' | 'CP' | 'MEM';
  declare note: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    ReferenceRangeRow.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        referenceSet: { type: DataTypes.STRING(40), allowNull: false },
        rowKey: { type: DataTypes.STRING(80), allowNull: false },
        code: { type: DataTypes.STRING(60), allowNull: false },
        label: { type: DataTypes.STRING(120), allowNull: false },
        sex: { type: DataTypes.ENUM('male', 'female', 'any'), allowNull: false },
        ageMinYears: { type: DataTypes.INTEGER, allowNull: true },
        ageMaxYears: { type: DataTypes.INTEGER, allowNull: true },
        unit: { type: DataTypes.STRING(20), allowNull: false },
        decimals: { type: DataTypes.TINYINT, allowNull: false },
        normalMin: { type: DataTypes.DOUBLE, allowNull: true },
        normalMax: { type: DataTypes.DOUBLE, allowNull: true },
        severityDirection: { type: DataTypes.ENUM('low', 'high'), allowNull: true },
        mildLimit: { type: DataTypes.DOUBLE, allowNull: true },
        moderateLimit: { type: DataTypes.DOUBLE, allowNull: true },
        source: { type: DataTypes.STRING(300), allowNull: false },
        provenance: { type: DataTypes.ENUM('SRC+', 'SRC~', 'CP', 'MEM'), allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'reference_ranges', modelName: 'ReferenceRangeRow', updatedAt: false },
    );
  }
}
