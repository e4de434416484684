// An uploaded spectrum: the raw bytes exactly as sent with their SHA-256, and the parsed points
// (x and y as little-endian float64 arrays).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type { AxisUnit, WavelengthMedium } from "../lib/spectrum/types";

export class SpectrumFile extends Model<
  InferAttributes<SpectrumFile>,
  InferCreationAttributes<SpectrumFile>
> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare instrumentId: string;
  declare kind: "lamp" | "sample";
  declare label: string;
  declare fileName: string;
  declare byteSize: number;
  declare sha256: string;
  declare rawBytes: Buffer;
  declare xUnit: AxisUnit;
  declare medium: WavelengthMedium | null;
  declare pointCount: number;
  declare xValues: Buffer;
  declare yValues: Buffer;
  declare meta: Record<string, string>;
  declare uploadedById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

SpectrumFile.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    instrumentId: { type: DataTypes.UUID, allowNull: false },
    kind: { type: DataTypes.TEXT, allowNull: false },
    label: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    fileName: { type: DataTypes.TEXT, allowNull: false },
    byteSize: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.TEXT, allowNull: false },
    rawBytes: { type: DataTypes.BLOB, allowNull: false },
    xUnit: { type: DataTypes.TEXT, allowNull: false },
    medium: { type: DataTypes.TEXT, allowNull: true },
    pointCount: { type: DataTypes.INTEGER, allowNull: false },
    xValues: { type: DataTypes.BLOB, allowNull: false },
    yValues: { type: DataTypes.BLOB, allowNull: false },
    meta: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    uploadedById: { type: DataTypes.UUID, allowNull: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "spectrum_files" },
);
