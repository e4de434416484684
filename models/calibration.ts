// One lamp calibration of an instrument: the fitted model as JSON, its pairs and quality, the line-table
// release and software version it came from, and its drift from the instrument's previous calibration.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type {
  CalibrationDrift,
  CalibrationPairing,
  CalibrationPairRecord,
  CalibrationUncertainty,
  CalibrationWarningRecord,
} from "../lib/calibrations/types";
import type { CalibrationModel } from "../lib/spectrum/calibration";
import type { AxisUnit } from "../lib/spectrum/types";

export class Calibration extends Model<
  InferAttributes<Calibration>,
  InferCreationAttributes<Calibration>
> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare instrumentId: string;
  declare spectrumId: string;
  declare lineReleaseId: string;
  declare previousCalibrationId: string | null;
  declare lamps: string[];
  declare requestedModel: string;
  declare modelKind: "polynomial" | "hartmann" | "prism";
  declare model: CalibrationModel;
  declare xUnit: AxisUnit;
  declare pairs: CalibrationPairRecord[];
  declare rejected: CalibrationPairRecord[];
  declare rmsNm: number;
  declare dof: number;
  declare coveredMinNm: number;
  declare coveredMaxNm: number;
  declare uncertainty: CalibrationUncertainty;
  declare drift: CalibrationDrift | null;
  declare pairing: CalibrationPairing;
  declare warnings: CalibrationWarningRecord[];
  declare softwareVersion: string;
  /** The calibration's date (YYYY-MM-DD): one calibration per instrument and date is the practice. */
  declare calibratedOn: string;
  declare createdById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Calibration.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    instrumentId: { type: DataTypes.UUID, allowNull: false },
    spectrumId: { type: DataTypes.UUID, allowNull: false },
    lineReleaseId: { type: DataTypes.UUID, allowNull: false },
    previousCalibrationId: { type: DataTypes.UUID, allowNull: true },
    lamps: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
    requestedModel: { type: DataTypes.TEXT, allowNull: false },
    modelKind: { type: DataTypes.TEXT, allowNull: false },
    model: { type: DataTypes.JSONB, allowNull: false },
    xUnit: { type: DataTypes.TEXT, allowNull: false },
    pairs: { type: DataTypes.JSONB, allowNull: false },
    rejected: { type: DataTypes.JSONB, allowNull: false },
    rmsNm: { type: DataTypes.DOUBLE, allowNull: false },
    dof: { type: DataTypes.INTEGER, allowNull: false },
    coveredMinNm: { type: DataTypes.DOUBLE, allowNull: false },
    coveredMaxNm: { type: DataTypes.DOUBLE, allowNull: false },
    uncertainty: { type: DataTypes.JSONB, allowNull: false },
    drift: { type: DataTypes.JSONB, allowNull: true },
    pairing: { type: DataTypes.JSONB, allowNull: false },
    warnings: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    softwareVersion: { type: DataTypes.TEXT, allowNull: false },
    calibratedOn: { type: DataTypes.DATEONLY, allowNull: false },
    createdById: { type: DataTypes.UUID, allowNull: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "calibrations" },
);
