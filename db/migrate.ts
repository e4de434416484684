// Runs pending migrations with umzug as the role that owns the schema (DATABASE_OWNER_URL), then gives
// the app's role (DATABASE_URL) its table privileges; `tsx db/migrate.ts` is called by the start and
// test scripts.
import path from "node:path";
import { Sequelize } from "sequelize";
import { SequelizeStorage, Umzug, type MigrationFn } from "umzug";
import { env } from "../lib/env";
import { appRoleOf, applyAppPrivileges } from "./privileges";
import { createSequelize } from "./sequelize";

export type Migration = MigrationFn<Sequelize>;

export function migrator(instance: Sequelize) {
  return new Umzug<Sequelize>({
    migrations: {
      glob: ["migrations/*.ts", { cwd: path.resolve(__dirname) }],
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => (await import(file!)).up({ context, name, path: file }),
        down: async () => (await import(file!)).down({ context, name, path: file }),
      }),
    },
    context: instance,
    storage: new SequelizeStorage({ sequelize: instance, tableName: "schema_migrations" }),
    logger: undefined,
  });
}

async function main(owner: Sequelize) {
  const settings = env();
  const appRole = appRoleOf(settings.databaseUrl, settings.databaseOwnerUrl);
  const ran = await migrator(owner).up();
  process.stdout.write(
    `[emberline] Migrations: ${ran.length ? ran.map((m) => m.name).join(", ") : "up to date"}\n`,
  );
  await applyAppPrivileges(owner, appRole);
  process.stdout.write(`[emberline] Privileges of the app role ${appRole} applied.\n`);
}

if (require.main === module) {
  const owner = createSequelize(env().databaseOwnerUrl);
  main(owner)
    .then(() => owner.close())
    .catch(async (error) => {
      process.stderr.write(
        `[emberline] Migration failed: ${error instanceof Error ? error.stack : error}\n`,
      );
      await owner.close();
      process.exit(1);
    });
}
