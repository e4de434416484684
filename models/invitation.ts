// An e-mailed invitation to join a team with a role; only the token's hash is stored.
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

export class Invitation extends Model<
  InferAttributes<Invitation>,
  InferCreationAttributes<Invitation>
> {
  declare id: CreationOptional<string>;
  declare teamId: ForeignKey<string>;
  declare email: string;
  declare role: TeamRole;
  declare tokenHash: string;
  declare invitedById: ForeignKey<string>;
  declare expiresAt: Date;
  declare acceptedAt: Date | null;
  declare revokedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Invitation.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    teamId: { type: DataTypes.UUID, allowNull: false },
    email: { type: DataTypes.TEXT, allowNull: false },
    role: { type: DataTypes.ENUM(...TEAM_ROLES), allowNull: false },
    tokenHash: { type: DataTypes.TEXT, allowNull: false },
    invitedById: { type: DataTypes.UUID, allowNull: false },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    acceptedAt: { type: DataTypes.DATE, allowNull: true },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: "invitations" },
);
