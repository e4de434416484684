// Synthetic lamp and flame files of the bench instruments (lib/spectrum/synthetic), their lines from the
// starter line table, as in tests/unit/spectrum/analysis/full-chain.test.ts.
import fs from "node:fs";
import path from "node:path";
import { parseLineTableCsv, toReferenceLine } from "@/lib/lines";
import { syntheticFlameFile } from "@/lib/spectrum/synthetic/synthetic-flame-file";
import type { SyntheticInstrument } from "@/lib/spectrum/synthetic/synthetic-instrument";
import { syntheticLampFile } from "@/lib/spectrum/synthetic/synthetic-lamp-file";
import type { ReferenceLine } from "@/lib/spectrum/types";

const starterCsv = fs.readFileSync(
  path.resolve(__dirname, "../../../db/lines/starter-lines.csv"),
  "utf8",
);
const table: ReferenceLine[] = parseLineTableCsv(starterCsv).rows.map((row, i) =>
  toReferenceLine(row, `row-${i}`),
);

/** The same flame as flameFile, exported on the instrument's own wavelength axis: "wavelength_nm,counts". */
export function flameFileOnWavelengthAxis(instrument: SyntheticInstrument, seed = 11): string {
  const counts = flameFile(instrument, seed)
    .trim()
    .split("\n")
    .slice(1)
    .map((row) => row.split(",")[1]);
  const rows = [
    "wavelength_nm,counts",
    ...counts.map((c, i) => `${instrument.wavelengthOfPixel(i).toFixed(4)},${c}`),
  ];
  return `${rows.join("\n")}\n`;
}

/** A mixed Hg–Ar lamp recorded on the instrument, as "pixel,counts" text. */
export function lampFile(instrument: SyntheticInstrument, seed = 3): string {
  return syntheticLampFile(instrument, table, seed);
}

/** A flame of Na, K, Li, Sr and Ca salts on a 2200 K continuum, recorded on the instrument, as "pixel,counts" text. */
export function flameFile(instrument: SyntheticInstrument, seed = 11): string {
  return syntheticFlameFile(instrument, table, seed);
}
