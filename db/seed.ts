// Seeds the demo lab (an invented lab with invented people). Idempotent: a second run adds nothing twice.
import fs from "node:fs";
import path from "node:path";
import { QueryTypes, type Transaction } from "sequelize";
import { hashPassword } from "../lib/auth/password";
import { parseLineTableCsv } from "../lib/lines";
import { BULK_INSERT_LINES_SQL, bulkInsertPayload } from "../lib/services/line-library-rows";
import type { TeamRole } from "../lib/auth/roles";
import { AuditEvent, Membership, Team, User, sequelize } from "../models";

export const DEMO_PASSWORD = "emberline-demo";

export const DEMO_PEOPLE: { email: string; name: string; memberships: [string, TeamRole][] }[] = [
  {
    email: "chem@demo.emberline.example",
    name: "Mara Quist",
    memberships: [["Flame Screening", "chemist"]],
  },
  {
    email: "super@demo.emberline.example",
    name: "Tobias Wren",
    memberships: [["Flame Screening", "supervisor"]],
  },
  {
    email: "lead@demo.emberline.example",
    name: "Ilse Varga",
    memberships: [
      ["Flame Screening", "lab_lead"],
      ["Arc and Spark Bench", "supervisor"],
    ],
  },
];

export async function seedDemo(): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const teams = new Map<string, Team>();
    for (const name of new Set(DEMO_PEOPLE.flatMap((p) => p.memberships.map(([team]) => team)))) {
      const [team, created] = await Team.findOrCreate({ where: { name }, transaction });
      if (created) {
        await AuditEvent.create(
          {
            actorId: null,
            teamId: team.id,
            action: "team.create",
            entity: "team",
            entityId: team.id,
            before: null,
            after: { name },
            reason: "Demo data",
          },
          { transaction },
        );
      }
      teams.set(name, team);
    }
    for (const person of DEMO_PEOPLE) {
      const [user, created] = await User.findOrCreate({
        where: { email: person.email },
        defaults: { email: person.email, name: person.name, passwordHash },
        transaction,
      });
      if (created) {
        await AuditEvent.create(
          {
            actorId: null,
            teamId: null,
            action: "user.create",
            entity: "user",
            entityId: user.id,
            before: null,
            after: { email: user.email },
            reason: "Demo data",
          },
          { transaction },
        );
      }
      for (const [teamName, role] of person.memberships) {
        const team = teams.get(teamName)!;
        const [membership, joined] = await Membership.findOrCreate({
          where: { userId: user.id, teamId: team.id },
          defaults: { userId: user.id, teamId: team.id, role },
          transaction,
        });
        if (joined) {
          await AuditEvent.create(
            {
              actorId: null,
              teamId: team.id,
              action: "membership.create",
              entity: "membership",
              entityId: membership.id,
              before: null,
              after: { userId: user.id, role },
              reason: "Demo data",
            },
            { transaction },
          );
        }
      }
    }
    for (const team of teams.values()) await seedStarterRelease(team, transaction);
  });
}

const STARTER_CSV = path.join(__dirname, "lines", "starter-lines.csv");

/**
 * Release 1 of a team that has no line table yet: the starter CSV, inserted into a draft in one
 * statement and then frozen by publishing it. Teams that already have releases are left alone.
 */
async function seedStarterRelease(team: Team, transaction: Transaction): Promise<void> {
  const [{ count }] = await sequelize.query<{ count: string }>(
    "SELECT count(*) AS count FROM line_releases WHERE team_id = $1",
    { bind: [team.id], type: QueryTypes.SELECT, transaction },
  );
  if (Number(count) > 0) return;
  const parsed = parseLineTableCsv(fs.readFileSync(STARTER_CSV, "utf8"));
  if (parsed.errors.length > 0) {
    const first = parsed.errors[0];
    throw new Error(
      `${STARTER_CSV}:${first.line}: ${first.field}: ${first.message} (${parsed.errors.length} problems)`,
    );
  }
  const [release] = await sequelize.query<{ id: string }>(
    "INSERT INTO line_releases (team_id) VALUES ($1) RETURNING id",
    { bind: [team.id], type: QueryTypes.SELECT, transaction },
  );
  await sequelize.query(BULK_INSERT_LINES_SQL, {
    bind: [release.id, bulkInsertPayload(parsed.rows)],
    transaction,
  });
  const notes =
    "Starter table: flame-test elements, hydrogen, lamp gases and mercury, flame bands (typed from memory, unverified).";
  await sequelize.query(
    `UPDATE line_releases SET status = 'published', number = 1, notes = $2, published_at = now() WHERE id = $1`,
    { bind: [release.id, notes], transaction },
  );
  await AuditEvent.create(
    {
      actorId: null,
      teamId: team.id,
      action: "line_release.publish",
      entity: "line_release",
      entityId: release.id,
      before: null,
      after: { status: "published", number: 1, lineCount: parsed.rows.length },
      reason: "Starter table",
    },
    { transaction },
  );
}

if (require.main === module) {
  seedDemo()
    .then(async () => {
      process.stdout.write("[emberline] Demo data is in place.\n");
      await sequelize.close();
    })
    .catch(async (error) => {
      process.stderr.write(
        `[emberline] Seeding failed: ${error instanceof Error ? error.stack : error}\n`,
      );
      await sequelize.close();
      process.exit(1);
    });
}
