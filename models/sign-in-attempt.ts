// One throttled event of an account: a password check (sign-in, password change, sign-off, joining a
// team), a password-reset request, a reset mail sent, or the unlock a completed reset gives.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";

export type AttemptKind = "password" | "reset_request" | "reset_mail" | "unlock";

export class SignInAttempt extends Model<
  InferAttributes<SignInAttempt>,
  InferCreationAttributes<SignInAttempt>
> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare address: string;
  declare succeeded: boolean;
  declare kind: CreationOptional<AttemptKind>;
  declare createdAt: CreationOptional<Date>;
}

SignInAttempt.init(
  {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.TEXT, allowNull: false },
    address: { type: DataTypes.TEXT, allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    kind: { type: DataTypes.TEXT, allowNull: false, defaultValue: "password" },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: "sign_in_attempts", updatedAt: false },
);
