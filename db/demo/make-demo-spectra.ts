// Writes the demo spectra used by the README's curl example and the demo data: an Hg–Ar lamp and a
// flame sample (Na, K, Li, Sr, Ca) on the invented "Bench grating" (2048 pixels, 350–900 nm).
// Invented data for the demo only, from the same generator the integration tests use.
// Run: npx tsx db/demo/make-demo-spectra.ts
import fs from "node:fs";
import path from "node:path";
import { flameFile, lampFile, syntheticGrating } from "../../tests/integration/support/synthetic-files";

const grating = syntheticGrating();
const header = "# Emberline demo spectrum (synthetic, invented for the demo): Bench grating, 2048 px, 350–900 nm\n";
fs.writeFileSync(path.join(__dirname, "bench-grating-lamp-hg-ar.csv"), header + lampFile(grating, 3));
fs.writeFileSync(path.join(__dirname, "bench-grating-flame-sample.csv"), header + flameFile(grating, 11));
process.stdout.write(`Wrote the demo spectra (nominal range ${grating.nominalRangeNm.join("–")} nm).\n`);
