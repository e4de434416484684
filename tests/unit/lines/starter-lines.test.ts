// Checks on the shipped starter line table: it parses cleanly, is large enough, names its sources,
// has no duplicates, and its key lines agree with published wavelengths typed here independently.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

import type { LineTableRow } from "@/lib/lines";
import {
  findDuplicateLines,
  formatLineTableCsv,
  parseLineTableCsv,
  toReferenceLine,
} from "@/lib/lines";
import { vacuumToAirNm } from "@/lib/spectrum/units";

const csvPath = path.resolve(__dirname, "../../../db/lines/starter-lines.csv");
const text = readFileSync(csvPath, "utf8");
const { rows, errors } = parseLineTableCsv(text);

/** The row of `species` nearest to `airNm`. */
function nearest(species: string, airNm: number): LineTableRow {
  const candidates = rows.filter((row) => row.species === species && row.airNm !== null);
  expect(candidates.length, `no ${species} rows`).toBeGreaterThan(0);
  return candidates.reduce((best, row) =>
    Math.abs(row.airNm! - airNm) < Math.abs(best.airNm! - airNm) ? row : best,
  );
}

/** Asserts the table has a `species` line within `toleranceNm` of the published air wavelength. */
function expectLine(species: string, airNm: number, toleranceNm: number): void {
  const row = nearest(species, airNm);
  expect(
    Math.abs(row.airNm! - airNm),
    `${species} ${airNm}: table has ${row.airNm}`,
  ).toBeLessThanOrEqual(toleranceNm);
}

/** Asserts the element's atomic line with the largest flame intensity lies within `toleranceNm` of `airNm`. */
function expectStrongestFlameLine(element: string, airNm: number, toleranceNm: number): void {
  const lines = rows.filter(
    (row) =>
      row.element === element && row.ionStage !== null && row.intensities.flame !== undefined,
  );
  expect(lines.length, `no flame intensities for ${element}`).toBeGreaterThan(0);
  const strongest = lines.reduce((best, row) =>
    row.intensities.flame! > best.intensities.flame! ? row : best,
  );
  expect(
    Math.abs(strongest.airNm! - airNm),
    `${element}: strongest flame line is ${strongest.airNm}`,
  ).toBeLessThanOrEqual(toleranceNm);
  expect(strongest.flags, `${element} ${strongest.airNm} should be persistent`).toContain(
    "persistent",
  );
}

// Published lamp wavelengths differ by up to 0.002 nm between conventions (common practice; see the brief).
const TOL = 0.002;

describe("starter line table", () => {
  it("parses with zero errors", () => {
    expect(errors).toEqual([]);
  });

  it("has at least 400 rows, each with a source that says it was typed from memory, none verified", () => {
    expect(rows.length).toBeGreaterThanOrEqual(400);
    for (const row of rows) {
      expect(row.source.trim()).not.toBe("");
      expect(row.source).toMatch(/from memory/);
      expect(row.verified).toBe(false);
    }
  });

  it("has no duplicate rows (same species, wavelength within 0.001 nm)", () => {
    expect(findDuplicateLines(rows, { toleranceNm: 0.001 })).toEqual([]);
  });

  it("keeps its air and vacuum columns consistent with the IAU conversion to 0.001 nm", () => {
    for (const row of rows) {
      if (row.airNm === null) {
        expect(row.vacuumNm).toBeLessThan(200);
        continue;
      }
      // Rounding the computed column to the typed decimals moves it by at most half a unit of 0.001 nm.
      expect(
        Math.abs(vacuumToAirNm(row.vacuumNm) - row.airNm),
        `${row.species} ${row.airNm}`,
      ).toBeLessThanOrEqual(0.0006);
    }
  });

  it("covers the flame-test elements, hydrogen, the lamp gases and the flame bands", () => {
    const species = new Set(rows.map((row) => row.species));
    const elements = [
      "Li",
      "Na",
      "K",
      "Rb",
      "Cs",
      "Mg",
      "Ca",
      "Sr",
      "Ba",
      "Cu",
      "Ag",
      "Tl",
      "In",
      "Ga",
      "Mn",
      "Fe",
      "Zn",
      "Pb",
      "Cr",
      "Al",
      "B",
      "Co",
      "Ni",
      "Cd",
      "Hg",
      "H",
    ];
    for (const element of elements) expect(species, element).toContain(`${element} I`);
    for (const ion of ["Ca II", "Sr II", "Ba II", "Mg II"]) expect(species).toContain(ion);
    for (const gas of ["Hg I", "Ne I", "Ar I", "He I", "Kr I", "Xe I"]) {
      const lampLines = rows.filter(
        (row) =>
          row.species === gas && row.flags.includes("lamp") && row.intensities.lamp !== undefined,
      );
      expect(lampLines.length, gas).toBeGreaterThanOrEqual(8);
    }
    for (const molecule of ["OH", "CH", "C2", "CaOH", "SrOH", "BaCl", "CuCl", "BO2"]) {
      const bands = rows.filter((row) => row.species === molecule);
      expect(bands.length, molecule).toBeGreaterThan(0);
      for (const band of bands) {
        expect(band.flags).toContain("band-head");
        expect(band.band?.extentNm).toBeGreaterThan(0);
      }
    }
  });

  it("gives energies, g and A for the lines used in Boltzmann plots", () => {
    for (const element of ["Fe", "Cu", "Ca", "Na", "K", "Li", "Hg"]) {
      const complete = rows.filter(
        (row) =>
          row.element === element &&
          row.upperEv !== null &&
          row.gUpper !== null &&
          row.aPerS !== null,
      );
      expect(complete.length, element).toBeGreaterThanOrEqual(element === "Fe" ? 10 : 2);
      // Boltzmann plots need a spread of upper-level energies, not one level.
      const spreadEv =
        Math.max(...complete.map((r) => r.upperEv!)) - Math.min(...complete.map((r) => r.upperEv!));
      expect(spreadEv, element).toBeGreaterThan(0.01);
    }
  });

  it("round-trips through the formatter and maps every row to a ReferenceLine", () => {
    const again = parseLineTableCsv(formatLineTableCsv(rows));
    expect(again.errors).toEqual([]);
    expect(again.rows).toEqual(rows);
    rows.forEach((row, index) => {
      const line = toReferenceLine(row, `starter-${index + 1}`);
      expect(Number.isFinite(line.airNm) && Number.isFinite(line.vacuumNm)).toBe(true);
      expect(line.flags.bandHead === true).toBe(line.band !== undefined);
    });
  });
});

// Outside checks. Every expected value below was typed from memory, independently of the CSV.
describe("starter line table against the NIST Atomic Spectra Database (from memory)", () => {
  it("has the sodium D lines, mercury lamp lines and H-alpha", () => {
    // NIST ASD (from memory): Na I D2 588.995 nm air.
    expectLine("Na I", 588.995, TOL);
    // NIST ASD (from memory): Na I D1 589.592 nm air.
    expectLine("Na I", 589.592, TOL);
    // NIST ASD (from memory): Hg I 435.833 nm air, natural mercury.
    expectLine("Hg I", 435.833, TOL);
    // NIST ASD (from memory): Hg I 546.074 nm air, natural mercury.
    expectLine("Hg I", 546.074, TOL);
    // NIST ASD (from memory): Hg I 253.652 nm air.
    expectLine("Hg I", 253.652, TOL);
    // NIST ASD (from memory): H I H-alpha 656.28 nm air; a fine-structure blend, so 0.007 nm.
    expectLine("H I", 656.28, 0.007);
    // NIST ASD (from memory): H I H-beta 486.13 nm air; a fine-structure blend, so 0.007 nm.
    expectLine("H I", 486.13, 0.007);
  });

  it("has the strongest ion lines", () => {
    // NIST ASD (from memory): Ca II K 393.366 nm and H 396.847 nm air.
    expectLine("Ca II", 393.366, TOL);
    expectLine("Ca II", 396.847, TOL);
    // NIST ASD (from memory): Ba II 455.403 nm and 493.408 nm air.
    expectLine("Ba II", 455.403, TOL);
    expectLine("Ba II", 493.408, TOL);
    // NIST ASD (from memory): Sr II 407.771 nm air.
    expectLine("Sr II", 407.771, TOL);
    // NIST ASD (from memory): Mg II 279.553 nm air.
    expectLine("Mg II", 279.553, TOL);
  });

  it("has the calibration-lamp lines most used", () => {
    // NIST ASD (from memory): Ne I 585.249 and 640.225 nm air.
    expectLine("Ne I", 585.249, TOL);
    expectLine("Ne I", 640.225, TOL);
    // NIST ASD (from memory): Ar I 763.511 and 811.531 nm air.
    expectLine("Ar I", 763.511, TOL);
    expectLine("Ar I", 811.531, TOL);
    // NIST ASD (from memory): He I 587.562 (blend) and 667.815 nm air.
    expectLine("He I", 587.562, TOL);
    expectLine("He I", 667.815, TOL);
    // NIST ASD (from memory): Kr I 587.092 nm air; Xe I 823.163 nm air.
    expectLine("Kr I", 587.092, TOL);
    expectLine("Xe I", 823.163, TOL);
  });

  it("gives each flame-test element its strongest flame line where the literature puts it", () => {
    // NIST ASD (from memory): Li I 670.776 nm air (the 2P3/2 component of the red doublet).
    expectStrongestFlameLine("Li", 670.776, TOL);
    // NIST ASD (from memory): Na I 588.995 nm air.
    expectStrongestFlameLine("Na", 588.995, TOL);
    // NIST ASD (from memory): K I 766.490 nm air; the doublet partner 769.896 nm.
    expectStrongestFlameLine("K", 766.49, TOL);
    expectLine("K I", 769.896, TOL);
    // NIST ASD (from memory): Rb I 780.027 nm air.
    expectStrongestFlameLine("Rb", 780.027, TOL);
    // NIST ASD (from memory): Cs I 852.113 nm air.
    expectStrongestFlameLine("Cs", 852.113, TOL);
    // NIST ASD (from memory): Ca I 422.673 nm air.
    expectStrongestFlameLine("Ca", 422.673, TOL);
    // NIST ASD (from memory): Sr I 460.733 nm air.
    expectStrongestFlameLine("Sr", 460.733, TOL);
    // NIST ASD (from memory): Ba I 553.548 nm air.
    expectStrongestFlameLine("Ba", 553.548, TOL);
    // NIST ASD (from memory): Cu I 324.754 nm air; the doublet partner 327.396 nm.
    expectStrongestFlameLine("Cu", 324.754, TOL);
    expectLine("Cu I", 327.396, TOL);
    // NIST ASD (from memory): Tl I 535.046 nm air.
    expectStrongestFlameLine("Tl", 535.046, TOL);
    // NIST ASD (from memory): In I 451.131 nm air.
    expectStrongestFlameLine("In", 451.131, TOL);
    // NIST ASD (from memory): Ga I 417.204 nm air.
    expectStrongestFlameLine("Ga", 417.204, TOL);
    // NIST ASD (from memory): Mn I 403.076 nm air.
    expectStrongestFlameLine("Mn", 403.076, TOL);
    // NIST ASD (from memory): Mg I 285.213 nm air.
    expectStrongestFlameLine("Mg", 285.213, TOL);
    // NIST ASD (from memory): Ag I 328.068 nm air.
    expectStrongestFlameLine("Ag", 328.068, TOL);
    // NIST ASD (from memory): Zn I 213.857 nm air.
    expectStrongestFlameLine("Zn", 213.857, TOL);
    // NIST ASD (from memory): Pb I 405.781 nm air.
    expectStrongestFlameLine("Pb", 405.781, TOL);
    // NIST ASD (from memory): Cr I 425.435 nm air.
    expectStrongestFlameLine("Cr", 425.435, TOL);
    // NIST ASD (from memory): Al I 396.152 nm air.
    expectStrongestFlameLine("Al", 396.152, TOL);
    // NIST ASD (from memory): Fe I 371.994 nm air.
    expectStrongestFlameLine("Fe", 371.994, TOL);
    // NIST ASD (from memory): B I 249.773 nm air (249.677 nm is its weaker partner).
    expectStrongestFlameLine("B", 249.773, TOL);
    expectLine("B I", 249.677, TOL);
    // NIST ASD (from memory): Cd I 228.802 nm air.
    expectStrongestFlameLine("Cd", 228.802, TOL);
    // NIST ASD (from memory): Hg I 253.652 nm air.
    expectStrongestFlameLine("Hg", 253.652, TOL);
  });

  it("puts the Swan band head of C2 where Pearse & Gaydon do (from memory)", () => {
    // Pearse & Gaydon, The Identification of Molecular Spectra (from memory): C2 Swan (0,0) head 516.52 nm, shaded to the violet.
    const swan = nearest("C2", 516.52);
    expect(Math.abs(swan.airNm! - 516.52)).toBeLessThanOrEqual(0.05);
    expect(swan.band?.degradesTo).toBe("violet");
  });
});
