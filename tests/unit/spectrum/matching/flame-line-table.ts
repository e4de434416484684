// A small line table of flame-test elements for the matching tests: real wavelengths, test-only intensities.
import type { ReferenceLine, SourceKind } from "../../../../lib/spectrum/types";

interface Row {
  species: string;
  airNm: number;
  flame?: number;
  arc?: number;
  band?: { extentNm: number; degradesTo: "red" | "violet" };
}

// Wavelengths: NIST Atomic Spectra Database, observed air wavelengths (from memory; checks use a
// tolerance of at least 0.002 nm, common practice). Band heads of CaOH near 554 and 622 nm are
// from the flame-emission literature (from memory, rounded to 0.1 nm). The flame and arc
// intensities are rough values invented for these tests (the order of strength of the lines is
// common practice: resonance lines dominate flames); they are not published numbers.
const ROWS: Row[] = [
  { species: "Na I", airNm: 588.995, flame: 1000, arc: 1000 },
  { species: "Na I", airNm: 589.5924, flame: 500, arc: 500 },
  { species: "Na I", airNm: 568.8205, flame: 5, arc: 80 },
  { species: "Na I", airNm: 568.2633, flame: 3, arc: 40 },
  { species: "Na I", airNm: 615.4225, flame: 1, arc: 20 },
  { species: "Na I", airNm: 616.0747, flame: 2, arc: 30 },
  { species: "K I", airNm: 766.4899, flame: 1000, arc: 1000 },
  { species: "K I", airNm: 769.8965, flame: 500, arc: 500 },
  { species: "K I", airNm: 404.4142, flame: 10, arc: 200 },
  { species: "K I", airNm: 404.7201, flame: 5, arc: 100 },
  { species: "K I", airNm: 693.8763, flame: 2, arc: 40 },
  { species: "Li I", airNm: 670.776, flame: 1000, arc: 1000 },
  { species: "Li I", airNm: 670.791, flame: 500, arc: 500 },
  { species: "Li I", airNm: 610.354, flame: 20, arc: 300 },
  { species: "Li I", airNm: 460.286, flame: 5, arc: 100 },
  { species: "Li I", airNm: 413.256, flame: 2, arc: 50 },
  { species: "Ca I", airNm: 422.6728, flame: 1000, arc: 1000 },
  { species: "Ca I", airNm: 445.4779, flame: 20, arc: 300 },
  { species: "Ca I", airNm: 443.4957, flame: 10, arc: 200 },
  { species: "Ca I", airNm: 430.2528, flame: 10, arc: 250 },
  { species: "Ca I", airNm: 616.2173, flame: 15, arc: 250 },
  { species: "Ca I", airNm: 612.2217, flame: 10, arc: 200 },
  { species: "Ca I", airNm: 558.8749, flame: 10, arc: 200 },
  { species: "Ca II", airNm: 393.3663, flame: 30, arc: 1000 },
  { species: "Ca II", airNm: 396.8469, flame: 15, arc: 500 },
  { species: "Sr I", airNm: 460.7331, flame: 1000, arc: 1000 },
  { species: "Sr I", airNm: 483.2075, flame: 10, arc: 200 },
  { species: "Sr II", airNm: 407.7709, flame: 100, arc: 1000 },
  { species: "Sr II", airNm: 421.5519, flame: 50, arc: 500 },
  { species: "Ba I", airNm: 553.5481, flame: 1000, arc: 1000 },
  { species: "Ba I", airNm: 705.9943, flame: 150, arc: 400 },
  { species: "Ba I", airNm: 577.762, flame: 60, arc: 300 },
  { species: "Ba II", airNm: 455.4033, flame: 200, arc: 1000 },
  { species: "Ba II", airNm: 493.4077, flame: 100, arc: 500 },
  { species: "Cu I", airNm: 324.754, flame: 1000, arc: 1000 },
  { species: "Cu I", airNm: 327.396, flame: 500, arc: 500 },
  { species: "Cu I", airNm: 521.82, flame: 100, arc: 250 },
  { species: "Cu I", airNm: 515.324, flame: 60, arc: 150 },
  { species: "Cu I", airNm: 510.554, flame: 30, arc: 150 },
  { species: "Tl I", airNm: 535.046, flame: 1000, arc: 1000 },
  { species: "In I", airNm: 451.131, flame: 1000, arc: 1000 },
  { species: "In I", airNm: 410.176, flame: 500, arc: 500 },
  { species: "CaOH", airNm: 554.0, flame: 1000, band: { extentNm: 8, degradesTo: "red" } },
  { species: "CaOH", airNm: 622.0, flame: 800, band: { extentNm: 10, degradesTo: "red" } },
];

function elementOf(species: string): { element: string; ionStage: number | null } {
  const [element, stage] = species.split(" ");
  if (!stage) return { element, ionStage: null };
  return { element, ionStage: stage === "I" ? 1 : stage === "II" ? 2 : 3 };
}

/** The test table as ReferenceLine rows; vacuum wavelengths are air × 1.00028, near enough here. */
export function flameLineTable(): ReferenceLine[] {
  return ROWS.map((row, i) => {
    const intensities: Partial<Record<SourceKind, number>> = {};
    if (row.flame !== undefined) intensities.flame = row.flame;
    if (row.arc !== undefined) intensities.arc = row.arc;
    return {
      id: `t${i}`,
      species: row.species,
      ...elementOf(row.species),
      airNm: row.airNm,
      vacuumNm: row.airNm * 1.00028,
      uncertaintyNm: row.band ? 0.1 : 0.001,
      intensities,
      flags: row.band ? { bandHead: true } : { persistent: (row.flame ?? 0) >= 500 },
      band: row.band,
    };
  });
}

/** Lines of the given species, as synthesis input: amplitude = countsAtStrongest × flame / 1000. */
export function flameEmission(
  table: ReferenceLine[],
  countsBySpecies: Record<string, number>,
): {
  lines: { wavelengthNm: number; amplitude: number }[];
  bands: { headNm: number; extentNm: number; degradesTo: "red" | "violet"; amplitude: number }[];
} {
  const lines: { wavelengthNm: number; amplitude: number }[] = [];
  const bands: {
    headNm: number;
    extentNm: number;
    degradesTo: "red" | "violet";
    amplitude: number;
  }[] = [];
  for (const line of table) {
    const counts = countsBySpecies[line.species];
    if (counts === undefined) continue;
    const strongest = Math.max(
      ...table.filter((l) => l.species === line.species).map((l) => l.intensities.flame ?? 0),
    );
    const amplitude = (counts * (line.intensities.flame ?? 0)) / strongest;
    if (line.band) bands.push({ headNm: line.airNm, ...line.band, amplitude });
    else lines.push({ wavelengthNm: line.airNm, amplitude });
  }
  return { lines, bands };
}
