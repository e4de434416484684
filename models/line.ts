// One row of a line-table release. line_key is the line's identity across releases; id is this row's.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type { LineFlag } from "../lib/lines";

export class Line extends Model<InferAttributes<Line>, InferCreationAttributes<Line>> {
  declare id: CreationOptional<string>;
  declare releaseId: ForeignKey<string>;
  declare lineKey: CreationOptional<string>;
  declare species: string;
  declare element: string;
  declare ionStage: number | null;
  declare airNm: number | null;
  declare vacuumNm: number;
  declare uncertaintyNm: number | null;
  declare intensityFlame: number | null;
  declare intensityArc: number | null;
  declare intensitySpark: number | null;
  declare intensityPlasma: number | null;
  declare intensityLamp: number | null;
  declare lowerEv: number | null;
  declare upperEv: number | null;
  declare gUpper: number | null;
  declare aPerS: number | null;
  declare flags: LineFlag[];
  declare bandExtentNm: number | null;
  declare bandDegradesTo: "red" | "violet" | null;
  declare source: string;
  declare note: CreationOptional<string>;
  declare verifiedById: string | null;
  declare verifiedAt: Date | null;
  declare retired: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const optionalNumber = { type: DataTypes.DOUBLE, allowNull: true };

Line.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    releaseId: { type: DataTypes.UUID, allowNull: false },
    lineKey: { type: DataTypes.UUID, allowNull: false, defaultValue: DataTypes.UUIDV4 },
    species: { type: DataTypes.TEXT, allowNull: false },
    element: { type: DataTypes.TEXT, allowNull: false },
    ionStage: { type: DataTypes.SMALLINT, allowNull: true },
    airNm: optionalNumber,
    vacuumNm: { type: DataTypes.DOUBLE, allowNull: false },
    uncertaintyNm: optionalNumber,
    intensityFlame: optionalNumber,
    intensityArc: optionalNumber,
    intensitySpark: optionalNumber,
    intensityPlasma: optionalNumber,
    intensityLamp: optionalNumber,
    lowerEv: optionalNumber,
    upperEv: optionalNumber,
    gUpper: { type: DataTypes.INTEGER, allowNull: true },
    aPerS: optionalNumber,
    flags: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
    bandExtentNm: optionalNumber,
    bandDegradesTo: { type: DataTypes.TEXT, allowNull: true },
    source: { type: DataTypes.TEXT, allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    verifiedById: { type: DataTypes.UUID, allowNull: true },
    verifiedAt: { type: DataTypes.DATE, allowNull: true },
    retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "lines" },
);
