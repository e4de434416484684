// The starter table's lamp lines: what automatic calibration is handed for each lamp gas. Ar lamps
// need lamp-flagged Ar I lines in the blue and red as well as the near infrared, and a slipped
// wavelength in a lamp line is a wrong calibration for everyone who uses it.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

import { parseLineTableCsv } from "@/lib/lines";

const text = readFileSync(path.resolve(__dirname, "../../../db/lines/starter-lines.csv"), "utf8");
const { rows, errors } = parseLineTableCsv(text);
const lampRows = (species: string, low: number, high: number) =>
  rows.filter(
    (r) =>
      r.species === species &&
      r.flags.includes("lamp") &&
      r.airNm !== null &&
      r.airNm >= low &&
      r.airNm <= high,
  );

describe("starter lamp lines", () => {
  it("parses without errors", () => {
    expect(errors).toEqual([]);
  });

  it("has the Ne I line at 602.9997 nm in air and none at 602.000", () => {
    // NIST Atomic Spectra Database, Ne I 602.9997 nm (air) (from memory).
    const ne = rows.filter(
      (r) => r.species === "Ne I" && r.airNm !== null && Math.abs(r.airNm - 603) < 1.5,
    );
    expect(ne.map((r) => r.airNm)).toEqual([602.9997]);
    // Vacuum and air agree through the IAU conversion (the parser checks it); the vacuum value moved with it.
    expect(ne[0].vacuumNm).toBeGreaterThan(603.1);
  });

  it("flags Ar I lamp lines between 400 and 700 nm, each with a lamp intensity", () => {
    const ar = lampRows("Ar I", 400, 700);
    expect(ar.length).toBeGreaterThanOrEqual(20);
    for (const row of ar) expect(row.intensities.lamp, `Ar I ${row.airNm}`).toBeGreaterThan(0);
    // The lines the issue lists by name (NIST ASD Ar I, from memory).
    for (const air of [
      416.418, 418.188, 419.832, 425.936, 427.217, 430.01, 433.356, 451.073, 549.587, 555.87,
      560.673, 603.213, 641.631, 667.728, 675.283, 687.129,
    ]) {
      expect(
        ar.some((r) => Math.abs(r.airNm! - air) <= 0.002),
        `Ar I ${air}`,
      ).toBe(true);
    }
  });

  it("gives every lamp-flagged line of the lamp gases a lamp intensity", () => {
    for (const species of ["Ar I", "Ne I", "He I", "Kr I", "Xe I", "Hg I"]) {
      for (const row of lampRows(species, 200, 1100))
        expect(row.intensities.lamp, `${species} ${row.airNm}`).toBeGreaterThan(0);
    }
  });

  it("has at least 6 lamp lines of each gas somewhere in 350–900 nm", () => {
    for (const species of ["Ar I", "Ne I", "He I", "Kr I", "Xe I", "Hg I"]) {
      expect(lampRows(species, 350, 900).length, species).toBeGreaterThanOrEqual(6);
    }
  });
});
