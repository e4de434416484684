// `npm run audit:verify [-- --team <uuid>] [-- --json]`: recomputes every team's audit hash chain
// (or one team's) and reports ok, or the first broken link of each chain; exits 1 when any is broken.
// Runs as the app's role (it only reads), under the react-server condition for the services it uses.
import { sequelize } from "../models";
import {
  verifyAllAuditChains,
  verifyTeamAuditChain,
  type AuditChainReport,
} from "../lib/services/audit-chain";

function describe(report: AuditChainReport): string {
  const team = report.teamId ?? "(no team)";
  if (report.ok) {
    const head = report.head ? `head ${report.head.sequence} ${report.head.hash}` : "empty";
    return `ok      team ${team}: ${report.checked} events, ${head}`;
  }
  const b = report.break!;
  return [
    `BROKEN  team ${team} at sequence ${b.sequence}, event ${b.eventId} (${b.problem}): ${b.detail}`,
    `        expected ${b.expected}`,
    `        found    ${b.found}`,
  ].join("\n");
}

async function main(): Promise<number> {
  const args = process.argv.slice(2);
  const teamIndex = args.indexOf("--team");
  const teamId = teamIndex >= 0 ? args[teamIndex + 1] : undefined;
  if (teamIndex >= 0 && !/^[0-9a-f-]{36}$/i.test(teamId ?? ""))
    throw new Error("--team takes a team id (uuid).");
  const reports = teamId ? [await verifyTeamAuditChain(teamId)] : await verifyAllAuditChains();
  if (args.includes("--json")) process.stdout.write(`${JSON.stringify(reports, null, 2)}\n`);
  else {
    for (const report of reports) process.stdout.write(`${describe(report)}\n`);
    if (reports.length === 0) process.stdout.write("The audit trail is empty.\n");
  }
  return reports.every((r) => r.ok) ? 0 : 1;
}

main()
  .then(async (code) => {
    await sequelize.close();
    process.exit(code);
  })
  .catch(async (error) => {
    process.stderr.write(
      `[emberline] audit:verify failed: ${error instanceof Error ? error.message : error}\n`,
    );
    await sequelize.close();
    process.exit(2);
  });
