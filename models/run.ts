// One identification run in a notebook: the sample, the calibration and line-table release used, the
// settings and software version, and every peak, candidate match and call with its evidence.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type { SourceKind } from "../lib/spectrum/types";

export class Run extends Model<InferAttributes<Run>, InferCreationAttributes<Run>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare notebookId: string;
  declare spectrumId: string;
  declare calibrationId: string | null;
  declare lineReleaseId: string;
  declare source: SourceKind;
  declare status: "complete";
  declare settings: unknown;
  declare lampChecked: boolean;
  declare softwareVersion: string;
  declare rangeMinNm: number;
  declare rangeMaxNm: number;
  declare noiseCounts: number;
  declare peaks: unknown;
  declare matches: unknown;
  declare calls: unknown;
  declare peakOverlaps: unknown;
  declare unexplained: unknown;
  declare warnings: unknown;
  declare createdById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Run.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    notebookId: { type: DataTypes.UUID, allowNull: false },
    spectrumId: { type: DataTypes.UUID, allowNull: false },
    calibrationId: { type: DataTypes.UUID, allowNull: true },
    lineReleaseId: { type: DataTypes.UUID, allowNull: false },
    source: { type: DataTypes.TEXT, allowNull: false },
    status: { type: DataTypes.TEXT, allowNull: false },
    settings: { type: DataTypes.JSONB, allowNull: false },
    lampChecked: { type: DataTypes.BOOLEAN, allowNull: false },
    softwareVersion: { type: DataTypes.TEXT, allowNull: false },
    rangeMinNm: { type: DataTypes.DOUBLE, allowNull: false },
    rangeMaxNm: { type: DataTypes.DOUBLE, allowNull: false },
    noiseCounts: { type: DataTypes.DOUBLE, allowNull: false },
    peaks: { type: DataTypes.JSONB, allowNull: false },
    matches: { type: DataTypes.JSONB, allowNull: false },
    calls: { type: DataTypes.JSONB, allowNull: false },
    peakOverlaps: { type: DataTypes.JSONB, allowNull: false },
    unexplained: { type: DataTypes.JSONB, allowNull: false },
    warnings: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    createdById: { type: DataTypes.UUID, allowNull: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "runs" },
);
