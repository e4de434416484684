// A team's spectrometer: its dispersion, array size, nominal range and resolution (and a prism's glass),
// and its export profile (how its files without a header are read).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import type { GlassName } from "../lib/spectrum/calibration";
import type { FirstColumnKind, WavelengthMedium } from "../lib/spectrum/types";
import { sequelize } from "../db/sequelize";

export class Instrument extends Model<
  InferAttributes<Instrument>,
  InferCreationAttributes<Instrument>
> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare name: string;
  declare dispersion: "prism" | "grating";
  declare pixels: number;
  declare nominalMinNm: number;
  declare nominalMaxNm: number;
  declare resolutionNm: number;
  declare detectorMax: number | null;
  declare glass: GlassName | null;
  declare apexDeg: number | null;
  /** What the first column of its exported files holds; null while no profile is set. */
  declare exportXUnit: FirstColumnKind | null;
  /** Air or vacuum for a wavelength profile; null when not known or not a wavelength. */
  declare exportMedium: WavelengthMedium | null;
  declare createdById: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Instrument.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    name: { type: DataTypes.TEXT, allowNull: false },
    dispersion: { type: DataTypes.TEXT, allowNull: false },
    pixels: { type: DataTypes.INTEGER, allowNull: false },
    nominalMinNm: { type: DataTypes.DOUBLE, allowNull: false },
    nominalMaxNm: { type: DataTypes.DOUBLE, allowNull: false },
    resolutionNm: { type: DataTypes.DOUBLE, allowNull: false },
    detectorMax: { type: DataTypes.DOUBLE, allowNull: true },
    glass: { type: DataTypes.TEXT, allowNull: true },
    apexDeg: { type: DataTypes.DOUBLE, allowNull: true },
    exportXUnit: { type: DataTypes.TEXT, allowNull: true },
    exportMedium: { type: DataTypes.TEXT, allowNull: true },
    createdById: { type: DataTypes.UUID, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "instruments", version: true },
);
