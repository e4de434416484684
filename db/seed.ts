// Seeds the demo lab (an invented lab with invented people). Idempotent: a second run adds nothing twice.
import { hashPassword } from "../lib/auth/password";
import type { TeamRole } from "../lib/auth/roles";
import { AuditEvent, Membership, Team, User, sequelize } from "../models";

export const DEMO_PASSWORD = "emberline-demo";

export const DEMO_PEOPLE: { email: string; name: string; memberships: [string, TeamRole][] }[] = [
  { email: "chem@demo.emberline.example", name: "Mara Quist", memberships: [["Flame Screening", "chemist"]] },
  { email: "super@demo.emberline.example", name: "Tobias Wren", memberships: [["Flame Screening", "supervisor"]] },
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
          { actorId: null, teamId: team.id, action: "team.create", entity: "team", entityId: team.id, before: null, after: { name }, reason: "Demo data" },
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
          { actorId: null, teamId: null, action: "user.create", entity: "user", entityId: user.id, before: null, after: { email: user.email }, reason: "Demo data" },
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
            { actorId: null, teamId: team.id, action: "membership.create", entity: "membership", entityId: membership.id, before: null, after: { userId: user.id, role }, reason: "Demo data" },
            { transaction },
          );
        }
      }
    }
  });
}

if (require.main === module) {
  seedDemo()
    .then(async () => {
      process.stdout.write("[emberline] Demo data is in place.\n");
      await sequelize.close();
    })
    .catch(async (error) => {
      process.stderr.write(`[emberline] Seeding failed: ${error instanceof Error ? error.stack : error}\n`);
      await sequelize.close();
      process.exit(1);
    });
}
