// Tests of the one row rule set: a row given as its cells by column name reads as the same row of a
// file does, and a typed row's cells (lineTableCells) read back as that row.
import { describe, expect, it } from "vitest";

import type { LineTableRow } from "@/lib/lines";
import {
  LINE_TABLE_COLUMN_NAMES,
  lineTableCells,
  parseLineTableCsv,
  readLineTableRow,
} from "@/lib/lines";

const cellsOf = (values: Record<string, string>) =>
  new Map(LINE_TABLE_COLUMN_NAMES.map((name) => [name, values[name] ?? ""]));

const SODIUM: LineTableRow = {
  species: "Na I",
  element: "Na",
  ionStage: 1,
  airNm: 588.995,
  vacuumNm: 589.158,
  uncertaintyNm: 0.001,
  intensities: { flame: 1000 },
  lowerEv: null,
  upperEv: null,
  gUpper: 4,
  aPerS: 6.16e7,
  flags: ["persistent", "resonance"],
  band: null,
  source: "=test source",
  verified: false,
  note: "'-guarded",
};

describe("readLineTableRow", () => {
  it("reads a typed row's cells back as the row", () => {
    const { row, errors } = readLineTableRow(lineTableCells(SODIUM));
    expect(errors).toEqual([]);
    expect(row).toEqual(SODIUM);
  });

  it("reports the same problems, under the column names, as the row of a file", () => {
    const values = {
      species: "Xx IX",
      air_nm: "589",
      vacuum_nm: "600",
      g_upper: "1.5",
      flags: "lamp;bogus",
      band_extent_nm: "2",
      source: "",
    };
    const csv = `${LINE_TABLE_COLUMN_NAMES.join(",")}\n${LINE_TABLE_COLUMN_NAMES.map((n) => values[n as keyof typeof values] ?? "").join(",")}\n`;
    const fromFile = parseLineTableCsv(csv).errors.map(({ field, message }) => ({
      field,
      message,
    }));
    const { row, errors } = readLineTableRow(cellsOf(values));
    expect(row).toBeNull();
    expect(errors).toEqual(fromFile);
    expect(errors.map((e) => e.field)).toEqual([
      "species",
      "air_nm",
      "g_upper",
      "flags",
      "band_extent_nm",
      "source",
    ]);
  });

  it("checks a species that starts with # as a species (a file would read that line as a comment)", () => {
    const { row, errors } = readLineTableRow(
      cellsOf({ species: "#Na I", air_nm: "588.995", source: "s" }),
    );
    expect(row).toBeNull();
    expect(errors.map((e) => e.field)).toEqual(["species"]);
  });

  it("refuses limits that make no sense, as the file reader does", () => {
    expect(() => readLineTableRow(cellsOf({}), { minWavelengthNm: 0 })).toThrow(RangeError);
  });
});
