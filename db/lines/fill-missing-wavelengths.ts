// Fills the blank air or vacuum column of a line-table CSV (the starter table is typed with one of them)
// using the project's IAU conversion, so the two columns agree. Run: npx tsx db/lines/fill-missing-wavelengths.ts [file]

import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import Papa from "papaparse";

import { formatLineTableCsv, parseLineTableCsv } from "../../lib/lines";

const file = process.argv[2] ?? path.join(__dirname, "starter-lines.csv");
const text = readFileSync(file, "utf8");

const { rows, errors } = parseLineTableCsv(text);
if (errors.length > 0) {
  for (const error of errors) {
    console.error(
      `${file}:${error.line}${error.column ? `:${error.column}` : ""} ${error.field}: ${error.message}`,
    );
  }
  process.exit(1);
}

// The parser keeps numbers, not the typed text; read the raw cells to know which column was blank
// and how many decimals were typed.
const raw = Papa.parse<Record<string, string>>(text, {
  header: true,
  comments: "#",
  skipEmptyLines: "greedy",
});
if (raw.data.length !== rows.length) throw new Error("raw and parsed row counts differ");

const decimalsOf = (cell: string) =>
  Math.max(3, cell.includes(".") ? cell.split(".")[1].length : 0);
const round = (value: number, decimals: number) => Number(value.toFixed(decimals));

let filled = 0;
rows.forEach((row, index) => {
  const airCell = (raw.data[index].air_nm ?? "").trim();
  const vacuumCell = (raw.data[index].vacuum_nm ?? "").trim();
  if (airCell !== "" && vacuumCell === "") {
    row.vacuumNm = round(row.vacuumNm, decimalsOf(airCell));
    filled++;
  } else if (vacuumCell !== "" && airCell === "" && row.airNm !== null) {
    row.airNm = round(row.airNm, decimalsOf(vacuumCell));
    filled++;
  }
});

// Keep the file's own comment header (everything above the generated column descriptions).
const comments: string[] = [];
for (const line of text.split(/\r?\n/)) {
  if (!line.startsWith("#") || line.startsWith("# Columns:")) break;
  comments.push(line.replace(/^# ?/, ""));
}

const output = formatLineTableCsv(rows, { comments });
const check = parseLineTableCsv(output);
if (check.errors.length > 0 || check.rows.length !== rows.length) {
  console.error("the filled table does not read back cleanly:", check.errors.slice(0, 5));
  process.exit(1);
}
writeFileSync(file, output);
console.log(`${file}: ${rows.length} rows, ${filled} wavelengths filled`);
