// Writes the demo spectra used by the README's curl example and the demo data: on the invented "Bench
// grating" (2048 pixels, 350–900 nm) an Hg–Ar lamp, a flame sample (Na, K, Li, Sr, Ca) and a second
// lamp recording kept as a check sample; on the invented "Bench prism" (F2, 60°, 2048 pixels) the same
// three. Invented data for the demo only, from the same generator the integration tests use
// (lib/spectrum/synthetic), its lines from the starter line table.
// Run: npx tsx db/demo/make-demo-spectra.ts
import fs from "node:fs";
import path from "node:path";
import { parseLineTableCsv, toReferenceLine } from "../../lib/lines";
import { syntheticFlameFile } from "../../lib/spectrum/synthetic/synthetic-flame-file";
import { syntheticGrating } from "../../lib/spectrum/synthetic/synthetic-grating";
import { syntheticLampFile } from "../../lib/spectrum/synthetic/synthetic-lamp-file";
import { syntheticPrism } from "../../lib/spectrum/synthetic/synthetic-prism";

const table = parseLineTableCsv(
  fs.readFileSync(path.join(__dirname, "../lines/starter-lines.csv"), "utf8"),
).rows.map((row, i) => toReferenceLine(row, `row-${i}`));
const grating = syntheticGrating();
const prism = syntheticPrism();
const gratingHeader =
  "# Emberline demo spectrum (synthetic, invented for the demo): Bench grating, 2048 px, 350–900 nm\n";
const prismHeader = `# Emberline demo spectrum (synthetic, invented for the demo): Bench prism, F2 60°, 2048 px, ${prism.nominalRangeNm.join("–")} nm\n`;
const files: [string, string][] = [
  ["bench-grating-lamp-hg-ar.csv", gratingHeader + syntheticLampFile(grating, table, 3)],
  ["bench-grating-flame-sample.csv", gratingHeader + syntheticFlameFile(grating, table, 11)],
  ["bench-grating-lamp-check.csv", gratingHeader + syntheticLampFile(grating, table, 4)],
  ["bench-prism-lamp-hg-ar.csv", prismHeader + syntheticLampFile(prism, table, 3)],
  ["bench-prism-flame-sample.csv", prismHeader + syntheticFlameFile(prism, table, 11)],
  ["bench-prism-lamp-check.csv", prismHeader + syntheticLampFile(prism, table, 4)],
];
for (const [name, text] of files) fs.writeFileSync(path.join(__dirname, name), text);
process.stdout.write(
  `Wrote ${files.length} demo spectra (grating ${grating.nominalRangeNm.join("–")} nm, prism ${prism.nominalRangeNm.join("–")} nm).\n`,
);
