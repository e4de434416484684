// A person's role in one team; a person can hold different roles in different teams.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import { TEAM_ROLES, type TeamRole } from "../lib/auth/roles";

export class Membership extends Model<
  InferAttributes<Membership>,
  InferCreationAttributes<Membership>
> {
  declare id: CreationOptional<string>;
  declare userId: ForeignKey<string>;
  declare teamId: ForeignKey<string>;
  declare role: TeamRole;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Membership.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    userId: { type: DataTypes.UUID, allowNull: false },
    teamId: { type: DataTypes.UUID, allowNull: false },
    role: { type: DataTypes.ENUM(...TEAM_ROLES), allowNull: false },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "memberships" },
);
