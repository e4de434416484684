// The formula guard shared by every CSV: formula-like text gets an apostrophe; the line-table export
// (the release export) guards its text cells too, and its own parser reads the guarded file back unchanged.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import "../../support/fast-check-seed";
import { formatLineTableCsv, parseLineTableCsv } from "@/lib/lines";
import { FORMULA_START, guardFormulaCell, unguardFormulaCell } from "@/lib/reports/formula-guard";

describe("guardFormulaCell", () => {
  it.each(['=HYPERLINK("http://evil.example","x")', "+1", "-2+3", "@SUM(A1)", "\tx", "\rx"])(
    "prefixes %j",
    (cell) => {
      expect(guardFormulaCell(cell)).toBe(`'${cell}`);
      expect(unguardFormulaCell(guardFormulaCell(cell))).toBe(cell);
    },
  );
  it("leaves ordinary text alone", () => {
    expect(guardFormulaCell("Kramida 2020")).toBe("Kramida 2020");
    expect(unguardFormulaCell("it's fine")).toBe("it's fine");
    expect(guardFormulaCell("'quoted'")).toBe("'quoted'");
  });
  // A random seed of the line table's round-trip property found a note "'-" read back as "-": the
  // reader took the text's own apostrophe for the guard's.
  it.each(["'-", "'=1", "''", "'''x", "'@"])(
    "writes %j so that it reads back unchanged",
    (cell) => {
      expect(guardFormulaCell(cell)).toBe(`'${cell}`);
      expect(unguardFormulaCell(guardFormulaCell(cell))).toBe(cell);
    },
  );
  it("reads back every text it writes, and writes none that starts a formula (property)", () => {
    const text = fc.string({ unit: fc.constantFrom("'", "-", "=", "+", "@", "\t", "a", " ") });
    fc.assert(
      fc.property(fc.oneof(text, fc.string()), (cell) => {
        expect(unguardFormulaCell(guardFormulaCell(cell))).toBe(cell);
        expect(guardFormulaCell(cell)).not.toMatch(FORMULA_START);
      }),
    );
  });
});

describe("the line table CSV (release export)", () => {
  it("writes no cell that starts a formula, and reads the guarded file back", () => {
    const csv = formatLineTableCsv([
      {
        species: "Na I",
        element: "Na",
        ionStage: 1,
        airNm: 588.995,
        vacuumNm: 589.158,
        uncertaintyNm: 0.001,
        intensities: { flame: 1000 },
        lowerEv: 0,
        upperEv: 2.104,
        gUpper: 4,
        aPerS: 6.16e7,
        flags: [],
        band: null,
        source: '=HYPERLINK("http://evil.example/","click")',
        verified: false,
        note: "@cmd|' /C calc'!A0",
      },
    ] as unknown as Parameters<typeof formatLineTableCsv>[0]);
    const dataLine = csv.split("\n").find((line) => line.startsWith("Na I"))!;
    expect(dataLine).toContain(`'=HYPERLINK`);
    for (const cell of dataLine.split(/,(?=(?:[^"]*"[^"]*")*[^"]*$)/))
      expect(cell.replace(/^"/, "")).not.toMatch(/^[=+@\t\r]/);
    const parsed = parseLineTableCsv(csv);
    expect(parsed.rows[0]?.source).toBe('=HYPERLINK("http://evil.example/","click")');
    expect(parsed.rows[0]?.note).toBe("@cmd|' /C calc'!A0");
  });
});
