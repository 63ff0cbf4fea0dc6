import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Sheet } from './sheet.model';
import type { User } from './user.model';

import type { MeasurementSource, Spectrum } from '@/contracts';

export type { MeasurementSource };

/** A recording's spectrum as stored for plotting (at most 512 points): the contract's shape, kept as is. */
export type StoredSpectrum = Spectrum;

/**
 * One belt-span pluck recorded against an approved sheet. Span length, belt mass per metre and the target come
 * from the sheet's frozen revision and are stored with the result, so the row reads the same forever.
 */
export class Measurement extends Model<InferAttributes<Measurement>, InferCreationAttributes<Measurement>> {
  declare id: CreationOptional<number>;
  declare sheetId: ForeignKey<Sheet['id']>;
  declare spanId: string;
  declare beltId: string;
  declare spanLengthMm: number;
  declare linearMassKgPerM: number;
  declare frequencyHz: number;
  declare tensionN: number;
  declare targetFrequencyHz: number;
  declare targetTensionN: number;
  /** (measured − target) / target × 100, on tension [%]. */
  declare deviationPct: number;
  declare source: MeasurementSource;
  /** 0..1 for recordings; null when typed. */
  declare confidence: number | null;
  declare spectrum: StoredSpectrum | null;
  declare recordingSha256: string | null;
  declare recordingSize: number | null;
  declare recordingName: string | null;
  declare measuredById: ForeignKey<User['id']>;
  declare measuredAt: Date;
}

/** Binds the Measurement model to a Sequelize instance. */
export function initMeasurementModel(sequelize: Sequelize): typeof Measurement {
  Measurement.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      spanId: { type: DataTypes.STRING(120), allowNull: false },
      beltId: { type: DataTypes.STRING(40), allowNull: false },
      spanLengthMm: { type: DataTypes.DOUBLE, allowNull: false },
      linearMassKgPerM: { type: DataTypes.DOUBLE, allowNull: false },
      frequencyHz: { type: DataTypes.DOUBLE, allowNull: false },
      tensionN: { type: DataTypes.DOUBLE, allowNull: false },
      targetFrequencyHz: { type: DataTypes.DOUBLE, allowNull: false },
      targetTensionN: { type: DataTypes.DOUBLE, allowNull: false },
      deviationPct: { type: DataTypes.DOUBLE, allowNull: false },
      source: { type: DataTypes.STRING(16), allowNull: false },
      confidence: { type: DataTypes.DOUBLE, allowNull: true },
      spectrum: { type: DataTypes.JSON, allowNull: true },
      recordingSha256: { type: DataTypes.CHAR(64), allowNull: true, field: 'recording_sha256' },
      recordingSize: { type: DataTypes.INTEGER, allowNull: true },
      recordingName: { type: DataTypes.STRING(200), allowNull: true },
      measuredAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'measurements', modelName: 'Measurement', timestamps: false },
  );
  return Measurement;
}
