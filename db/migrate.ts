// Runs pending migrations with umzug; `tsx db/migrate.ts` is called by the start and test scripts.
import path from "node:path";
import { Sequelize } from "sequelize";
import { SequelizeStorage, Umzug, type MigrationFn } from "umzug";
import { sequelize } from "./sequelize";

export type Migration = MigrationFn<Sequelize>;

export function migrator(instance: Sequelize = sequelize) {
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

async function main() {
  const ran = await migrator().up();
  process.stdout.write(
    `[emberline] Migrations: ${ran.length ? ran.map((m) => m.name).join(", ") : "up to date"}\n`,
  );
  await sequelize.close();
}

if (require.main === module) {
  main().catch(async (error) => {
    process.stderr.write(`[emberline] Migration failed: ${error instanceof Error ? error.stack : error}\n`);
    await sequelize.close();
    process.exit(1);
  });
}
