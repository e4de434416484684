// One removal of a person from a team (append-only): the credentials they held then stop opening
// the team's records, with a 401 that says why instead of a bare "not found".
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

export class MembershipRemoval extends Model<
  InferAttributes<MembershipRemoval>,
  InferCreationAttributes<MembershipRemoval>
> {
  declare id: CreationOptional<string>;
  declare teamId: ForeignKey<string>;
  declare userId: ForeignKey<string>;
  /** The role the person held when removed. */
  declare role: TeamRole;
  declare removedById: ForeignKey<string>;
  declare removedAt: CreationOptional<Date>;
}

MembershipRemoval.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    userId: { type: DataTypes.UUID, allowNull: false },
    role: { type: DataTypes.ENUM(...TEAM_ROLES), allowNull: false },
    removedById: { type: DataTypes.UUID, allowNull: false },
    removedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "membership_removals", timestamps: false },
);
