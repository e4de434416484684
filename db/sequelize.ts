// The one Sequelize instance. Kept on globalThis outside production so hot reload does not open
// a new pool on every change.
import pg from "pg";
import { Sequelize } from "sequelize";
import { env } from "../lib/env";

const globalForDb = globalThis as unknown as { emberlineSequelize?: Sequelize };

/** A Sequelize instance on `url` (the app's connection unless told otherwise; migrations pass the owner's). */
export function createSequelize(url: string = env().databaseUrl): Sequelize {
  const settings = env();
  return new Sequelize(url, {
    dialect: "postgres",
    dialectModule: pg,
    logging: process.env.EMBERLINE_SQL_LOG === "1" ? console.log : false,
    pool: { max: settings.databasePoolMax, min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true, timestamps: true },
  });
}

export const sequelize: Sequelize = globalForDb.emberlineSequelize ?? createSequelize();
if (process.env.NODE_ENV !== "production") globalForDb.emberlineSequelize = sequelize;
