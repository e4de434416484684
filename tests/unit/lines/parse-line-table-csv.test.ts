// Tests of the line-table CSV: located errors, computed air/vacuum columns, round trip and ReferenceLine mapping.
import fc from "fast-check";
import { describe, expect, it } from "vitest";

import type { LineTableRow } from "@/lib/lines";
import {
  findDuplicateLines,
  formatLineTableCsv,
  LINE_TABLE_COLUMN_NAMES,
  parseLineTableCsv,
  parseSpecies,
  toReferenceLine,
} from "@/lib/lines";
import { airToVacuumNm } from "@/lib/spectrum/units";

const HEADER =
  "species,air_nm,vacuum_nm,uncertainty_nm,intensity_flame,flags,band_extent_nm,band_degrades_to,source,note";
const column = (name: string) => HEADER.split(",").indexOf(name) + 1;

/** A file with a comment, the header, and the given data lines (file line 3 onwards). */
const file = (...dataLines: string[]) => ["# test table", HEADER, ...dataLines].join("\n") + "\n";

describe("parseLineTableCsv: located errors", () => {
  it("accepts a clean file and skips comments and blank lines", () => {
    const text = file(
      "Na I,588.995,,0.001,1000,persistent;resonance,,,test source,",
      "",
      "# a comment, with commas",
      "K I,766.490,,,,,,,test source,",
    );
    const { rows, rowLines, errors } = parseLineTableCsv(text);
    expect(errors).toEqual([]);
    expect(rows.map((r) => r.species)).toEqual(["Na I", "K I"]);
    expect(rowLines).toEqual([3, 6]);
  });

  it("locates a bad number by line and column", () => {
    const { rows, errors } = parseLineTableCsv(
      file("Na I,588.995,,0.001,1000,,,,s,", "K I,766.49x,,,,,,,s,"),
    );
    expect(rows).toHaveLength(1);
    expect(errors).toEqual([
      expect.objectContaining({
        line: 4,
        column: column("air_nm"),
        field: "air_nm",
        message: expect.stringMatching(/not a number/),
      }),
    ]);
  });

  it("rejects decimal commas and non-finite numbers", () => {
    const { errors } = parseLineTableCsv(
      file('K I,"766,49",,,,,,,s,', "K I,Infinity,,,,,,,s,", "K I,766.49,,NaN,,,,,s,"),
    );
    expect(errors.map((e) => [e.line, e.field])).toEqual([
      [3, "air_nm"],
      [4, "air_nm"],
      [5, "uncertainty_nm"],
    ]);
  });

  it("locates an unknown species", () => {
    const { errors } = parseLineTableCsv(file("Xy I,500.000,,,,,,,s,"));
    expect(errors).toEqual([
      expect.objectContaining({
        line: 3,
        column: 1,
        field: "species",
        message: expect.stringMatching(/not an element symbol/),
      }),
    ]);
  });

  it("locates a missing source", () => {
    const { rows, errors } = parseLineTableCsv(file("Na I,588.995,,,,,,,  ,"));
    expect(rows).toEqual([]);
    expect(errors).toEqual([
      expect.objectContaining({ line: 3, column: column("source"), field: "source" }),
    ]);
  });

  it("locates a wavelength out of range, with the range taken from the options", () => {
    const { errors } = parseLineTableCsv(
      file("Na I,25000,,,,,,,s,", "Na I,,50,,,,,,s,", "Na I,588.995,,,,,,,s,"),
    );
    expect(errors.map((e) => [e.line, e.column, e.field])).toEqual([
      [3, column("air_nm"), "air_nm"],
      [4, column("vacuum_nm"), "vacuum_nm"],
    ]);
    const narrow = parseLineTableCsv(file("Na I,588.995,,,,,,,s,"), {
      minWavelengthNm: 200,
      maxWavelengthNm: 500,
    });
    expect(narrow.errors).toEqual([
      expect.objectContaining({
        line: 3,
        field: "air_nm",
        message: expect.stringMatching(/outside/),
      }),
    ]);
  });

  it("locates air and vacuum wavelengths that disagree", () => {
    // 589.158 nm vacuum is 588.995 nm in air (NIST ASD, Na D2, from memory); 589.300 is 0.14 nm off.
    const { rows, errors } = parseLineTableCsv(
      file("Na I,588.995,589.158,,,,,,s,", "Na I,588.995,589.300,,,,,,s,"),
    );
    expect(rows).toHaveLength(1);
    expect(errors).toEqual([
      expect.objectContaining({
        line: 4,
        column: column("air_nm"),
        field: "air_nm",
        message: expect.stringMatching(/disagree/),
      }),
    ]);
  });

  it("widens the air/vacuum tolerance to a larger stated uncertainty", () => {
    // 589.160 vacuum is 0.0018 nm from 588.995 air + 0.003: fine at 0.002 nm; 589.165 needs the 0.01 nm uncertainty.
    const { errors } = parseLineTableCsv(
      file("Na I,588.995,589.165,0.01,,,,,s,", "Na I,588.995,589.165,0.001,,,,,s,"),
    );
    expect(errors.map((e) => e.line)).toEqual([4]);
  });

  it("locates an unknown flag", () => {
    const { errors } = parseLineTableCsv(file("Na I,588.995,,,,persistent;shiny,,,s,"));
    expect(errors).toEqual([
      expect.objectContaining({
        line: 3,
        column: column("flags"),
        field: "flags",
        message: expect.stringMatching(/unknown flag "shiny"/),
      }),
    ]);
  });

  it("allows band fields only on band heads, and requires both there", () => {
    const { rows, errors } = parseLineTableCsv(
      file(
        "C2,516.52,,0.02,300,band-head,6,violet,s,",
        "Na I,588.995,,,,,3,,s,",
        "C2,473.71,,,,band-head,,violet,s,",
        "C2,563.55,,,,band-head,5,blue,s,",
        "Ca I,422.673,,,,band-head,5,red,s,",
      ),
    );
    expect(rows.map((r) => r.band)).toEqual([{ extentNm: 6, degradesTo: "violet" }]);
    expect(errors.map((e) => [e.line, e.field])).toEqual([
      [4, "band_extent_nm"],
      [5, "band_extent_nm"],
      [6, "band_degrades_to"],
      [7, "flags"],
    ]);
  });

  it("counts lines correctly after quoted cells that span lines", () => {
    const { rows, errors } = parseLineTableCsv(
      file('Na I,588.995,,,,,,,s,"two\nline note"', "Na I,bad,,,,,,,s,"),
    );
    expect(rows[0].note).toBe("two\nline note");
    expect(errors).toEqual([expect.objectContaining({ line: 5, field: "air_nm" })]);
  });

  it("reports header problems and rows of the wrong width", () => {
    expect(parseLineTableCsv("species,air_nm,colour\n").errors).toEqual([
      expect.objectContaining({
        line: 1,
        column: 3,
        field: "header",
        message: expect.stringMatching(/unknown column "colour"/),
      }),
      expect.objectContaining({
        line: 1,
        field: "header",
        message: expect.stringMatching(/"source"/),
      }),
    ]);
    expect(parseLineTableCsv("species,source\nNa I,s\n").errors).toEqual([
      expect.objectContaining({
        line: 1,
        field: "header",
        message: expect.stringMatching(/air_nm/),
      }),
    ]);
    expect(parseLineTableCsv(file("Na I,588.995,s")).errors).toEqual([
      expect.objectContaining({ line: 3, field: "row" }),
    ]);
    expect(parseLineTableCsv("# only comments\n").errors).toEqual([
      expect.objectContaining({ field: "header" }),
    ]);
  });

  it("checks energies against the photon energy and g, A, intensities for sign", () => {
    const header = "species,air_nm,lower_ev,upper_ev,g_upper,a_per_s,intensity_arc,source";
    const text = [
      header,
      // Na D2: upper level 2.1044 eV above the ground state (NIST ASD, from memory).
      "Na I,588.995,0,2.1044,4,6.16e7,1000,s",
      "Na I,588.995,0,2.5,4,6.16e7,1000,s",
      "Na I,588.995,2.1,1.0,4,6.16e7,1000,s",
      "Na I,588.995,0,2.1044,2.5,6.16e7,1000,s",
      "Na I,588.995,0,2.1044,4,-1,1000,s",
      "Na I,588.995,0,2.1044,4,6.16e7,-5,s",
    ].join("\n");
    const { rows, errors } = parseLineTableCsv(text);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      lowerEv: 0,
      upperEv: 2.1044,
      gUpper: 4,
      aPerS: 6.16e7,
      intensities: { arc: 1000 },
    });
    expect(errors.map((e) => [e.line, e.field])).toEqual([
      [3, "upper_ev"],
      [4, "upper_ev"],
      [5, "g_upper"],
      [6, "a_per_s"],
      [7, "intensity_arc"],
    ]);
  });

  it("rejects bad option values", () => {
    expect(() => parseLineTableCsv("", { minWavelengthNm: -1 })).toThrow(RangeError);
    expect(() => parseLineTableCsv("", { minWavelengthNm: 500, maxWavelengthNm: 400 })).toThrow(
      RangeError,
    );
    expect(() => parseLineTableCsv("", { airVacuumToleranceNm: Number.NaN })).toThrow(RangeError);
  });
});

describe("parseLineTableCsv: computed wavelength column", () => {
  it("computes vacuum from air and air from vacuum, air only from 200 nm up", () => {
    const { rows, errors } = parseLineTableCsv(
      file("Na I,588.995,,,,,,,s,", "Na I,,589.158,,,,,,s,", "Hg I,,184.950,,,,,,s,"),
    );
    expect(errors).toEqual([]);
    // Na D2: 588.995 nm air = 589.158 nm vacuum (NIST ASD, from memory); tolerance 0.001 nm.
    expect(rows[0].vacuumNm).toBeCloseTo(589.158, 3);
    expect(Math.abs(rows[1].airNm! - 588.995)).toBeLessThan(0.001);
    expect(rows[2].airNm).toBeNull();
    expect(rows[2].vacuumNm).toBe(184.95);
  });

  it("rejects air wavelengths below 200 nm", () => {
    const { errors } = parseLineTableCsv(file("Hg I,184.9,,,,,,,s,"));
    expect(errors).toEqual([
      expect.objectContaining({
        line: 3,
        field: "air_nm",
        message: expect.stringMatching(/give vacuum_nm/),
      }),
    ]);
  });
});

const SAMPLE = [
  "species,air_nm,vacuum_nm,uncertainty_nm,intensity_flame,intensity_arc,intensity_spark,intensity_plasma,intensity_lamp,lower_ev,upper_ev,g_upper,a_per_s,flags,band_extent_nm,band_degrades_to,source,verified,note",
  'Na I,588.995,,0.001,1000,1000,,,500,0,2.1044,4,6.16e7,resonance;persistent;lamp,,,"NIST ASD, from memory",false,"D2, with ""quotes"""',
  "Hg I,,184.950,0.002,,,,,500,,,,,lamp,,,from memory,TRUE,",
  "BO₂,518.1,,0.5,1000,,,,,,,,,band-head,6,red,from memory,,diffuse",
].join("\n");

describe("formatLineTableCsv", () => {
  it("round-trips parsed rows exactly", () => {
    const first = parseLineTableCsv(SAMPLE);
    expect(first.errors).toEqual([]);
    expect(first.rows[0].flags).toEqual(["persistent", "lamp", "resonance"]);
    expect(first.rows[1].verified).toBe(true);
    expect(first.rows[2].species).toBe("BO2");
    const text = formatLineTableCsv(first.rows, {
      comments: ["Release 1", "", "second paragraph"],
    });
    const second = parseLineTableCsv(text);
    expect(second.errors).toEqual([]);
    expect(second.rows).toEqual(first.rows);
    expect(text.startsWith("# Release 1\n#\n# second paragraph\n# Columns:\n")).toBe(true);
    expect(text).toContain(LINE_TABLE_COLUMN_NAMES.join(","));
  });

  it("documents every column in the comment header", () => {
    const text = formatLineTableCsv([]);
    for (const name of LINE_TABLE_COLUMN_NAMES)
      expect(text).toMatch(new RegExp(`^#   ${name}( \\(required\\))?: `, "m"));
    expect(formatLineTableCsv([], { describeColumns: false })).toBe(
      LINE_TABLE_COLUMN_NAMES.join(",") + "\n",
    );
  });

  it("round-trips arbitrary valid rows (property)", () => {
    const text = fc
      .string({ unit: "grapheme" })
      .map((t) => t.replace(/[\r\u0000-\u001f]/g, " ").trim());
    const optional = fc.option(fc.double({ min: 0, max: 1e4, noNaN: true }), { nil: null });
    const row: fc.Arbitrary<LineTableRow> = fc
      .record({
        species: fc.constantFrom("Na I", "Ca II", "Fe I", "Hg I", "Ba II"),
        airNm: fc.double({ min: 201, max: 19000, noNaN: true }),
        uncertaintyNm: fc.option(fc.double({ min: 1e-4, max: 1, noNaN: true }), { nil: null }),
        flame: optional,
        lamp: optional,
        lowerEv: optional,
        gUpper: fc.option(fc.integer({ min: 1, max: 30 }), { nil: null }),
        aPerS: fc.option(fc.double({ min: 1, max: 1e10, noNaN: true }), { nil: null }),
        flags: fc.subarray(["persistent", "lamp", "resonance", "blend"] as const),
        source: text.filter((t) => t !== ""),
        verified: fc.boolean(),
        note: text,
      })
      .map((g) => {
        const { element, ionStage } = parseSpecies(g.species);
        const intensities: LineTableRow["intensities"] = {};
        if (g.flame !== null) intensities.flame = g.flame;
        if (g.lamp !== null) intensities.lamp = g.lamp;
        return {
          species: g.species,
          element,
          ionStage,
          airNm: g.airNm,
          vacuumNm: airToVacuumNm(g.airNm),
          uncertaintyNm: g.uncertaintyNm,
          intensities,
          lowerEv: g.lowerEv,
          upperEv: null,
          gUpper: g.gUpper,
          aPerS: g.aPerS,
          flags: [...g.flags],
          band: null,
          source: g.source,
          verified: g.verified,
          note: g.note,
        };
      });
    fc.assert(
      fc.property(fc.array(row, { maxLength: 8 }), (rows) => {
        const parsed = parseLineTableCsv(formatLineTableCsv(rows));
        expect(parsed.errors).toEqual([]);
        expect(parsed.rows).toEqual(rows);
      }),
      { numRuns: 200 },
    );
  });
});

describe("the line_key column", () => {
  const KEYS = ["2b7e1516-28ae-4d2a-a6f7-15883c4f3c01", "2b7e1516-28ae-4d2a-a6f7-15883c4f3c02"];
  const rows = parseLineTableCsv(SAMPLE).rows.slice(0, 2);

  it("is written first when the rows' keys are given, and read back with them", () => {
    const text = formatLineTableCsv(rows, { lineKeys: KEYS, describeColumns: false });
    expect(text.split("\n")[0]).toBe(["line_key", ...LINE_TABLE_COLUMN_NAMES].join(","));
    const parsed = parseLineTableCsv(text, { readLineKeys: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.rows).toEqual(rows);
    expect(parsed.lineKeys).toEqual(KEYS);
    expect(parsed.lineKeyColumn).toBe(1);
  });

  it("is an unknown column unless keys are asked for", () => {
    const text = formatLineTableCsv(rows, { lineKeys: KEYS, describeColumns: false });
    expect(parseLineTableCsv(text).errors).toEqual([
      expect.objectContaining({ line: 1, column: 1, field: "header" }),
    ]);
  });

  it("may stand anywhere; a blank key is null, and errors keep the file's own columns", () => {
    const text = [
      "species,air_nm,line_key,source",
      `Na I,588.995,${KEYS[0]},s`,
      "K I,766.490,,s",
      `Li I,67x.8,${KEYS[1]},s`,
    ].join("\n");
    const parsed = parseLineTableCsv(text, { readLineKeys: true });
    expect(parsed.lineKeyColumn).toBe(3);
    expect(parsed.lineKeys).toEqual([KEYS[0], null]);
    expect(parsed.errors).toEqual([
      expect.objectContaining({ line: 4, column: 2, field: "air_nm" }),
    ]);
  });

  it("needs one key per row", () => {
    expect(() => formatLineTableCsv(rows, { lineKeys: KEYS.slice(1) })).toThrow(RangeError);
  });
});

describe("toReferenceLine", () => {
  const [naD2, hg185, bo2] = parseLineTableCsv(SAMPLE).rows;

  it("maps every field the core uses", () => {
    const line = toReferenceLine(naD2, "na-d2");
    expect(line).toEqual({
      id: "na-d2",
      species: "Na I",
      element: "Na",
      ionStage: 1,
      airNm: 588.995,
      vacuumNm: naD2.vacuumNm,
      uncertaintyNm: 0.001,
      intensities: { flame: 1000, arc: 1000, lamp: 500 },
      lowerEv: 0,
      upperEv: 2.1044,
      g: 4,
      a: 6.16e7,
      flags: { persistent: true, lamp: true },
    });
  });

  it("gives band heads their band and vacuum-only lines their vacuum wavelength", () => {
    const band = toReferenceLine(bo2, "bo2");
    expect(band.ionStage).toBeNull();
    expect(band.flags).toEqual({ bandHead: true });
    expect(band.band).toEqual({ extentNm: 6, degradesTo: "red" });
    const vuv = toReferenceLine(hg185, "hg185", { defaultUncertaintyNm: 0.005 });
    expect(vuv.airNm).toBe(184.95);
    expect(vuv.uncertaintyNm).toBe(0.002);
    expect(vuv.upperEv).toBeUndefined();
  });

  it("uses the default uncertainty where the row states none, and checks its inputs", () => {
    const row: LineTableRow = { ...naD2, uncertaintyNm: null };
    expect(toReferenceLine(row, "x").uncertaintyNm).toBe(0.002);
    expect(toReferenceLine(row, "x", { defaultUncertaintyNm: 0.01 }).uncertaintyNm).toBe(0.01);
    expect(() => toReferenceLine(row, "")).toThrow(RangeError);
    expect(() => toReferenceLine(row, "x", { defaultUncertaintyNm: 0 })).toThrow(RangeError);
  });

  it("does not share objects with the row", () => {
    const line = toReferenceLine(bo2, "bo2");
    line.band!.extentNm = 99;
    line.intensities.flame = 1;
    expect(bo2.band!.extentNm).toBe(6);
    expect(bo2.intensities.flame).toBe(1000);
  });
});

describe("findDuplicateLines", () => {
  it("pairs rows of one species within the tolerance only", () => {
    const rows = [
      { species: "Na I", vacuumNm: 589.158 },
      { species: "K I", vacuumNm: 589.158 },
      { species: "Na I", vacuumNm: 589.1585 },
      { species: "Na I", vacuumNm: 589.7 },
    ];
    expect(findDuplicateLines(rows)).toEqual([[0, 2]]);
    expect(findDuplicateLines(rows, { toleranceNm: 0.6 })).toEqual([
      [0, 2],
      [0, 3],
      [2, 3],
    ]);
    expect(() => findDuplicateLines(rows, { toleranceNm: -1 })).toThrow(RangeError);
  });
});
