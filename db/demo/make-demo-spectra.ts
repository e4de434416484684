// Writes the demo spectra used by the README's curl example and the demo data: on the invented "Bench
// grating" (2048 pixels, 350–900 nm) an Hg–Ar lamp, a flame sample (Na, K, Li, Sr, Ca) and a second
// lamp recording kept as a check sample; on the invented "Bench prism" (F2, 60°, 2048 pixels) the same
// three. Invented data for the demo only, from the same generator the integration tests use.
// Run: npx tsx db/demo/make-demo-spectra.ts
import fs from "node:fs";
import path from "node:path";
import {
  flameFile,
  lampFile,
  syntheticGrating,
  syntheticPrism,
} from "../../tests/integration/support/synthetic-files";

const grating = syntheticGrating();
const prism = syntheticPrism();
const gratingHeader =
  "# Emberline demo spectrum (synthetic, invented for the demo): Bench grating, 2048 px, 350–900 nm\n";
const prismHeader = `# Emberline demo spectrum (synthetic, invented for the demo): Bench prism, F2 60°, 2048 px, ${prism.nominalRangeNm.join("–")} nm\n`;
const files: [string, string][] = [
  ["bench-grating-lamp-hg-ar.csv", gratingHeader + lampFile(grating, 3)],
  ["bench-grating-flame-sample.csv", gratingHeader + flameFile(grating, 11)],
  ["bench-grating-lamp-check.csv", gratingHeader + lampFile(grating, 4)],
  ["bench-prism-lamp-hg-ar.csv", prismHeader + lampFile(prism, 3)],
  ["bench-prism-flame-sample.csv", prismHeader + flameFile(prism, 11)],
  ["bench-prism-lamp-check.csv", prismHeader + lampFile(prism, 4)],
];
for (const [name, text] of files) fs.writeFileSync(path.join(__dirname, name), text);
process.stdout.write(
  `Wrote ${files.length} demo spectra (grating ${grating.nominalRangeNm.join("–")} nm, prism ${prism.nominalRangeNm.join("–")} nm).\n`,
);
