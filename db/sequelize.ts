// The one Sequelize instance. Kept on globalThis outside production so hot reload does not open
// a new pool on every change.
import pg from "pg";
import { Sequelize } from "sequelize";
import { env } from "../lib/env";

const globalForDb = globalThis as unknown as { emberlineSequelize?: Sequelize };

function createSequelize(): Sequelize {
  const settings = env();
  return new Sequelize(settings.databaseUrl, {
    dialect: "postgres",
    dialectModule: pg,
    logging: process.env.EMBERLINE_SQL_LOG === "1" ? console.log : false,
    pool: { max: settings.databasePoolMax, min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true, timestamps: true },
  });
}

export const sequelize: Sequelize = globalForDb.emberlineSequelize ?? createSequelize();
if (process.env.NODE_ENV !== "production") globalForDb.emberlineSequelize = sequelize;
