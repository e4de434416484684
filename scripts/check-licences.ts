// `npm run licences`: fails when a package of the production install has a non-commercial,
// share-alike/copyleft or unknown licence that licence-allow-list.json does not name as reviewed.
// Reads package-lock.json and the installed package.json files only: no network. `--summary` prints
// the licence table the README lists; `--json` the whole report.
import fs from "node:fs";
import path from "node:path";
import { installedLicence } from "./licences/installed-licence";
import {
  assertAllowList,
  checkLicences,
  licenceSummary,
  productionPackages,
  type Lockfile,
} from "./licences/licence-policy";

const root = path.resolve(__dirname, "..");
const args = process.argv.slice(2);

function readJson(file: string): unknown {
  return JSON.parse(fs.readFileSync(file, "utf8"));
}

const lock = readJson(path.join(root, "package-lock.json")) as Lockfile;
const allowList = assertAllowList(readJson(path.join(root, "licence-allow-list.json")));
const packages = productionPackages(lock);

const report = checkLicences(packages, installedLicence(root, lock), allowList);

if (args.includes("--json")) {
  process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
} else if (args.includes("--summary")) {
  for (const row of licenceSummary(report.findings)) {
    const shown =
      row.packages.length <= 4
        ? row.packages.join(", ")
        : `${row.packages.slice(0, 3).join(", ")} and ${row.packages.length - 3} more`;
    process.stdout.write(`${row.licence}\t${row.count}\t${shown}\n`);
  }
} else {
  const cleared = report.findings.filter((f) => f.allowedBy !== null).length;
  process.stdout.write(
    `[licences] ${report.findings.length} production packages; ${cleared} cleared by licence-allow-list.json\n`,
  );
}

for (const f of report.failures) {
  process.stderr.write(
    `[licences] ${f.package.name}@${f.package.version}: ${f.licence ?? "no licence stated"} is ${f.category} (via ${f.package.via.join(" → ")}). Replace the package, or review it and add it to licence-allow-list.json with the reason.\n`,
  );
}
for (const entry of report.unusedAllowances) {
  process.stderr.write(
    `[licences] licence-allow-list.json clears ${entry.package} under ${entry.licence}, but no production package matches it any more: remove the entry.\n`,
  );
}
process.exit(report.failures.length > 0 || report.unusedAllowances.length > 0 ? 1 : 0);
