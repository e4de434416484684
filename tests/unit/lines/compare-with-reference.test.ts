// The reference check's pure part: reading a reference file (located errors, medium from a column or
// for the whole file) and pairing its lines with draft rows, agreeing within the combined uncertainty.
import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import {
  compareWithReference,
  parseReferenceCsv,
  type DraftLineForCheck,
  type ReferenceFileLine,
} from "@/lib/lines";
import { airToVacuumNm, vacuumToAirNm } from "@/lib/spectrum/units";

const draft = (
  id: string,
  species: string,
  airNm: number | null,
  uncertaintyNm: number | null,
  extra: Partial<DraftLineForCheck> = {},
): DraftLineForCheck => ({
  id,
  species,
  airNm,
  vacuumNm: airNm === null ? (extra.vacuumNm ?? 0) : airToVacuumNm(airNm),
  uncertaintyNm,
  verified: false,
  retired: false,
  ...extra,
});

const reference = (
  species: string,
  wavelengthNm: number,
  uncertaintyNm: number,
  medium: "air" | "vacuum" = "air",
): ReferenceFileLine => ({
  species,
  wavelengthNm,
  uncertaintyNm,
  medium,
  citation: "test citation",
  line: 2,
});

describe("parseReferenceCsv", () => {
  it("reads the example reference file of the fixtures", () => {
    const text = fs.readFileSync(
      path.resolve(__dirname, "../../fixtures/lines/reference-check-example.csv"),
      "utf8",
    );
    const { lines, errors } = parseReferenceCsv(text);
    expect(errors).toEqual([]);
    expect(lines.map((l) => `${l.species} ${l.wavelengthNm} ${l.medium}`)).toContain(
      "Na I 588.995 air",
    );
    expect(lines.every((l) => l.citation.length > 0 && l.uncertaintyNm > 0)).toBe(true);
  });

  it("takes the medium from its column, else from the option, and refuses a row with neither", () => {
    const text =
      "species,wavelength_nm,uncertainty_nm,citation,medium\nNa I,588.995,0.0002,c,\nHg I,184.95,0.001,c,vacuum\n";
    expect(parseReferenceCsv(text, { medium: "air" }).lines.map((l) => l.medium)).toEqual([
      "air",
      "vacuum",
    ]);
    const refused = parseReferenceCsv(text);
    expect(refused.lines).toHaveLength(1);
    expect(refused.errors).toEqual([
      expect.objectContaining({ line: 2, column: 5, field: "medium" }),
    ]);
  });

  it("locates each bad cell and leaves the row out", () => {
    const text = [
      "# comment line",
      "citation,species,wavelength_nm,uncertainty_nm,intensity",
      "c,Na I,588.995,0.0002,100",
      "c,Xx I,588.995,0.0002,",
      "c,Na I,58x.9,0.0002,",
      "c,Na I,588.995,0,",
      ",Na I,588.995,0.001,",
      "c,Hg I,184.95,0.001,",
    ].join("\n");
    const { lines, errors } = parseReferenceCsv(text, { medium: "air" });
    expect(lines).toHaveLength(1);
    expect(errors.map((e) => [e.line, e.field])).toEqual([
      [4, "species"],
      [5, "wavelength_nm"],
      [6, "uncertainty_nm"],
      [7, "citation"],
      [8, "wavelength_nm"],
    ]);
    expect(errors[4].message).toMatch(/in vacuum/);
  });

  it("names a missing required column and an empty file", () => {
    expect(
      parseReferenceCsv("species,wavelength_nm,citation\nNa I,588.995,c\n").errors[0].message,
    ).toMatch(/"uncertainty_nm" is missing/);
    expect(parseReferenceCsv("").errors[0].message).toMatch(/no header/);
    expect(
      parseReferenceCsv("species,wavelength_nm,uncertainty_nm,citation\n", { medium: "air" })
        .errors[0].message,
    ).toMatch(/no lines/);
  });
});

describe("compareWithReference", () => {
  it("agrees within the combined uncertainty and disagrees just beyond it", () => {
    // u_c = √(0.003² + 0.004²) = 0.005 nm.
    const rows = [draft("a", "K I", 766.49, 0.003), draft("b", "K I", 769.896, 0.003)];
    const result = compareWithReference(rows, [
      reference("K I", 766.49 + 0.0049, 0.004),
      reference("K I", 769.896 - 0.0052, 0.004),
    ]);
    expect(result.agreeing.map((p) => p.lineId)).toEqual(["a"]);
    expect(result.agreeing[0].combinedUncertaintyNm).toBeCloseTo(0.005, 12);
    expect(result.agreeing[0].differenceNm).toBeCloseTo(-0.0049, 9);
    expect(result.disagreeing.map((p) => p.lineId)).toEqual(["b"]);
    expect(result.disagreeing[0].toleranceNm).toBeCloseTo(0.005, 12);
    // A wider coverage factor turns the second into agreement.
    const k2 = compareWithReference(rows, [reference("K I", 769.896 - 0.0052, 0.004)], {
      coverageFactor: 2,
    });
    expect(k2.agreeing.map((p) => p.lineId)).toEqual(["b"]);
  });

  it("never allows less than 0.002 nm, and a draft row without an uncertainty uses the reference's alone", () => {
    const result = compareWithReference(
      [draft("a", "Na I", 588.995, 0.0001), draft("b", "Na I", 589.592, null)],
      [reference("Na I", 588.9965, 0.0001), reference("Na I", 589.5935, 0.0001)],
    );
    // 0.0015 nm apart with u_c ≈ 0.00014 nm: within the 0.002 nm floor (common practice).
    expect(result.agreeing.map((p) => p.lineId)).toEqual(["a", "b"]);
    expect(result.agreeing[0].toleranceNm).toBe(0.002);
    expect(result.agreeing[1].draftUncertaintyStated).toBe(false);
    expect(result.agreeing[1].combinedUncertaintyNm).toBeCloseTo(0.0001, 12);
  });

  it("compares in the reference's medium, through the Morton (2000) conversion", () => {
    const airNm = 546.074;
    const vacuumNm = airToVacuumNm(airNm);
    const rows = [draft("hg", "Hg I", airNm, 0.001)];
    // The same line stated in vacuum agrees; its vacuum value read as air would be 0.15 nm off.
    const inVacuum = compareWithReference(rows, [reference("Hg I", vacuumNm, 0.001, "vacuum")]);
    expect(inVacuum.agreeing).toHaveLength(1);
    expect(inVacuum.agreeing[0].draftNm).toBe(vacuumNm);
    expect(inVacuum.agreeing[0].medium).toBe("vacuum");
    const misread = compareWithReference(rows, [reference("Hg I", vacuumNm, 0.001, "air")]);
    expect(misread.agreeing).toHaveLength(0);
    expect(misread.referenceOnly).toEqual([0]);
    // Below 200 nm a draft row has only a vacuum wavelength; a vacuum reference compares with it.
    const vuv = compareWithReference(
      [draft("uv", "Hg I", null, 0.002, { vacuumNm: 184.95 })],
      [reference("Hg I", 184.9499, 0.0005, "vacuum")],
    );
    expect(vuv.agreeing.map((p) => p.lineId)).toEqual(["uv"]);
    expect(vacuumToAirNm(vacuumNm)).toBeCloseTo(airNm, 9);
  });

  it("pairs one to one, closest first, and lists what is unpaired on each side", () => {
    const rows = [
      draft("d1", "Na I", 588.995, 0.001),
      draft("d2", "Na I", 589.592, 0.001),
      draft("d3", "Na I", 818.326, 0.002),
      draft("k", "K I", 766.49, 0.002),
      draft("ret", "Na I", 330.237, 0.002, { retired: true }),
    ];
    const result = compareWithReference(rows, [
      reference("Na I", 588.9951, 0.0002),
      // Two reference lines near one draft row: only the closer pairs.
      reference("Na I", 589.5921, 0.0002),
      reference("Na I", 589.64, 0.0002),
      reference("Na I", 285.281, 0.0005),
      reference("Na I", 330.237, 0.0005),
    ]);
    expect(result.agreeing.map((p) => [p.lineId, p.referenceIndex])).toEqual([
      ["d1", 0],
      ["d2", 1],
    ]);
    // The retired row is not compared, so its reference line has no draft row.
    expect(result.referenceOnly).toEqual([2, 3, 4]);
    expect(result.draftOnly).toEqual(["d3"]);
    expect(result.otherSpeciesCount).toBe(1);
    expect(result.retiredCount).toBe(1);
  });

  it("keeps verified rows that agree apart, and lists verified rows that disagree", () => {
    const rows = [
      draft("v1", "Na I", 588.995, 0.001, { verified: true }),
      draft("v2", "Na I", 589.592, 0.001, { verified: true }),
    ];
    const result = compareWithReference(rows, [
      reference("Na I", 588.995, 0.0002),
      reference("Na I", 589.6, 0.0002),
    ]);
    expect(result.agreeing).toEqual([]);
    expect(result.alreadyVerified.map((p) => p.lineId)).toEqual(["v1"]);
    expect(result.disagreeing.map((p) => p.lineId)).toEqual(["v2"]);
  });

  it("refuses nonsense options", () => {
    expect(() => compareWithReference([], [], { coverageFactor: 0 })).toThrow(RangeError);
    expect(() => compareWithReference([], [], { pairingWindowNm: Number.NaN })).toThrow(RangeError);
  });
});
