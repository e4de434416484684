// One identification run in a notebook: the sample, the calibration and line-table release used, the
// settings and software version, and every peak, candidate match and call with its evidence (frozen
// by the database), plus its place in review (status, round, notes; frozen once signed).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type {
  RunPeak,
  RunSettings,
  RunStatus,
  RunTemperature,
  RunUnexplainedPeak,
  RunWarning,
  StoredPeakMatch,
  StoredPeakOverlap,
  StoredRunCall,
} from "../lib/runs/types";
import type { SourceKind } from "../lib/spectrum/types";

export class Run extends Model<InferAttributes<Run>, InferCreationAttributes<Run>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare notebookId: string;
  declare spectrumId: string;
  declare calibrationId: string | null;
  declare lineReleaseId: string;
  declare source: SourceKind;
  declare status: CreationOptional<RunStatus>;
  declare settings: RunSettings;
  declare lampChecked: boolean;
  declare softwareVersion: string;
  declare rangeMinNm: number;
  declare rangeMaxNm: number;
  declare noiseCounts: number;
  declare peaks: RunPeak[];
  declare matches: StoredPeakMatch[];
  declare calls: StoredRunCall[];
  declare peakOverlaps: StoredPeakOverlap[];
  declare unexplained: RunUnexplainedPeak[];
  declare warnings: RunWarning[];
  declare temperature: RunTemperature | null;
  declare continuum: Buffer | null;
  declare versionNumber: CreationOptional<number>;
  declare amendsRunId: CreationOptional<string | null>;
  declare rerunOfId: CreationOptional<string | null>;
  declare notes: CreationOptional<string>;
  declare reviewRound: CreationOptional<number>;
  declare requestedReviewerId: CreationOptional<string | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare signedAt: CreationOptional<Date | null>;
  declare lockVersion: CreationOptional<number>;
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
    status: { type: DataTypes.TEXT, allowNull: false, defaultValue: "draft" },
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
    temperature: { type: DataTypes.JSONB, allowNull: true },
    continuum: { type: DataTypes.BLOB, allowNull: true },
    versionNumber: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    amendsRunId: { type: DataTypes.UUID, allowNull: true },
    rerunOfId: { type: DataTypes.UUID, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    reviewRound: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    requestedReviewerId: { type: DataTypes.UUID, allowNull: true },
    submittedAt: { type: DataTypes.DATE, allowNull: true },
    signedAt: { type: DataTypes.DATE, allowNull: true },
    lockVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdById: { type: DataTypes.UUID, allowNull: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "runs" },
);
