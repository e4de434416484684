// A release of a team's line table: the one editable draft (number null) or a frozen published release.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";

export class LineRelease extends Model<
  InferAttributes<LineRelease>,
  InferCreationAttributes<LineRelease>
> {
  declare id: CreationOptional<string>;
  declare teamId: ForeignKey<string>;
  declare number: number | null;
  declare status: CreationOptional<"draft" | "published">;
  declare notes: CreationOptional<string>;
  declare basedOnReleaseId: string | null;
  declare createdById: string | null;
  declare publishedById: CreationOptional<string | null>;
  declare publishedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

LineRelease.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    number: { type: DataTypes.INTEGER, allowNull: true },
    status: { type: DataTypes.ENUM("draft", "published"), allowNull: false, defaultValue: "draft" },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    basedOnReleaseId: { type: DataTypes.UUID, allowNull: true },
    createdById: { type: DataTypes.UUID, allowNull: true },
    publishedById: { type: DataTypes.UUID, allowNull: true },
    publishedAt: { type: DataTypes.DATE, allowNull: true },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "line_releases", version: true },
);
