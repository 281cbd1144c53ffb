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

export class Probe extends Model<InferAttributes<Probe>, InferCreationAttributes<Probe>> {
  declare id: CreationOptional<number>;
  declare scannerId: ForeignKey<number> | null;
  declare kind: ProbeKind;
  /** The clinic's own label for the model, e.g. "L-12 superficial". */
  declare modelLabel: string;
  declare serialNumber: string;
  declare minFrequencyMhz: number;
  declare maxFrequencyMhz: number;
  declare endocavitary: CreationOptional<boolean>;
  declare inServiceFrom: string;
  declare inServiceTo: string | null;
  /** Optimistic lock: bumped by every catalog edit. */
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Probe.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        scannerId: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.ENUM(...PROBE_KIND_CODES), allowNull: false },
        modelLabel: { type: DataTypes.STRING(80), allowNull: false },
        serialNumber: { type: DataTypes.STRING(60), allowNull: false, unique: true },
        // DECIMAL comes back from the driver as a string; FLOAT keeps 1-decimal MHz exact enough.
        minFrequencyMhz: { type: DataTypes.FLOAT, allowNull: false },
        maxFrequencyMhz: { type: DataTypes.FLOAT, allowNull: false },
        endocavitary: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        inServiceFrom: { type: DataTypes.DATEONLY, allowNull: false },
        inServiceTo: { type: DataTypes.DATEONLY, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'probes', modelName: 'Probe' },
    );
  }
}
