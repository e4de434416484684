// One sign-in attempt, kept to throttle repeated failures per account and per address.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
} from "sequelize";
import { sequelize } from "../db/sequelize";

export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare address: string;
  declare succeeded: boolean;
  declare createdAt: CreationOptional<Date>;
}

SignInAttempt.init(
  {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    email: { type: DataTypes.TEXT, allowNull: false },
    address: { type: DataTypes.TEXT, allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: "sign_in_attempts", updatedAt: false },
);
