// Holds the row scanner to the line-by-line reader: same spectrum or same located error on random, often odd, texts.
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { SpectrumParseError, parseSpectrumText } from "../../../../lib/spectrum/io";
import type { ParseSpectrumTextOptions } from "../../../../lib/spectrum/io";
import { scanDataRows } from "../../../../lib/spectrum/io/scan-data-rows";

type Outcome =
  | { kind: "spectrum"; x: number[]; y: number[]; xUnit: string; meta: Record<string, string> }
  | { kind: "error"; code: string; line: number | null; column: number | null; message: string };

function outcome(text: string, options: ParseSpectrumTextOptions): Outcome {
  try {
    const s = parseSpectrumText(text, options);
    return {
      kind: "spectrum",
      x: Array.from(s.x),
      y: Array.from(s.y),
      xUnit: s.xUnit,
      meta: s.meta,
    };
  } catch (error) {
    if (!(error instanceof SpectrumParseError)) throw error;
    return {
      kind: "error",
      code: error.code,
      line: error.line,
      column: error.column,
      message: error.message,
    };
  }
}

/** toEqual does not tell −0 from 0; Number() does, so the scanner must too. */
function expectSameSigns(a: Outcome, b: Outcome) {
  if (a.kind !== "spectrum" || b.kind !== "spectrum") return;
  a.x.forEach((v, i) => expect(Object.is(v, b.x[i])).toBe(true));
  a.y.forEach((v, i) => expect(Object.is(v, b.y[i])).toBe(true));
}

/** One numeric cell written in one of the ways files write numbers, for the value `value`. */
const numberCell = (value: number, decimal: "." | ",") =>
  fc.constantFrom("plain", "fixed", "exponent", "long", "padded", "signed").map((style) => {
    let cell: string;
    if (style === "fixed") cell = value.toFixed(2);
    else if (style === "exponent") cell = value.toExponential(5);
    else if (style === "long") cell = (value + 0.12345678901234567).toPrecision(21);
    else if (style === "padded") cell = value >= 0 ? `000${value}` : String(value);
    else if (style === "signed") cell = value >= 0 ? `+${value}` : String(value);
    else cell = String(value);
    return decimal === "," ? cell.replace(".", ",") : cell;
  });

/** Cells that should make either reader refuse, or that only the line reader handles. */
const ODD_CELLS = [
  "",
  "abc",
  "NaN",
  "Infinity",
  "1e400",
  "1e",
  "+",
  "-0",
  ".5",
  "5.",
  "1,5",
  "1.5",
  '"12"',
  "0x1F",
  " 7 ",
  "\u00a012",
  "12\u00a0",
  "1 2",
  "\v3",
];
const ODD_LINES = ["", "   ", "\t", "# note", "% note", "// note", "; note", "\u00a0", "/ 3"];
const SEPARATORS = [",", ";", "\t", " ", "   ", ", ", " ,", "\t ", " \t"];
const ENDINGS = ["\n", "\r\n"];

const oddText = fc
  .record({
    separator: fc.constantFrom(...SEPARATORS),
    decimal: fc.constantFrom<"." | ",">(".", ","),
    rows: fc.oneof(fc.integer({ min: 0, max: 40 }), fc.integer({ min: 16, max: 40 })),
    start: fc.integer({ min: -50, max: 5000 }),
    thirdColumn: fc.constantFrom("", "label", " ", "1"),
    trailing: fc.constantFrom("", ",", ";", "\t", " ", ",,", " ; "),
    header: fc.constantFrom(
      "",
      "pixel,counts",
      "pixel;counts",
      "wavelength (nm)\tcounts",
      "# pixel counts",
    ),
    ending: fc.constantFrom(...ENDINGS),
    bom: fc.boolean(),
    descending: fc.boolean(),
    seed: fc.array(fc.integer({ min: 0, max: 1_000_000 }), { minLength: 40, maxLength: 40 }),
  })
  .chain((base) => {
    // Increasing x, so that undamaged files read through; steps of 0.25 to 1.75.
    let x = base.start;
    const xs = base.seed.map((s) => (x += (1 + (s % 7)) * 0.25));
    return fc.record({
      base: fc.constant(base),
      xCells: fc.tuple(...xs.map((v) => numberCell(v, base.decimal))),
      yCells: fc.tuple(...base.seed.map((s) => numberCell((s - 100_000) / 100, base.decimal))),
      // Damage: [row, what, which odd thing]
      damage: fc.oneof(
        fc.constant([]),
        fc.array(
          fc.tuple(fc.nat(), fc.constantFrom("x", "y", "line", "lone-cr", "ending"), fc.nat()),
          {
            maxLength: 3,
          },
        ),
      ),
    });
  })
  .map(({ base, xCells, yCells, damage }) => {
    const order = Array.from({ length: base.rows }, (_, i) =>
      base.descending ? base.rows - 1 - i : i,
    );
    const rows = order.map((i) => {
      const cells = [xCells[i], yCells[i]];
      if (base.thirdColumn) cells.push(base.thirdColumn);
      return { cells, before: "", ending: base.ending };
    });
    for (const [pick, what, which] of damage) {
      if (rows.length === 0) break;
      const row = rows[pick % rows.length];
      if (what === "x") row.cells[0] = ODD_CELLS[which % ODD_CELLS.length];
      else if (what === "y") row.cells[1] = ODD_CELLS[which % ODD_CELLS.length];
      else if (what === "line") row.before = ODD_LINES[which % ODD_LINES.length] + base.ending;
      else if (what === "lone-cr") row.ending = "\r";
      else row.ending = which % 2 ? "\n" : "\r\n";
    }
    let text = base.bom ? "\ufeff" : "";
    if (base.header) text += base.header + base.ending;
    for (const row of rows)
      text += row.before + row.cells.join(base.separator) + base.trailing + row.ending;
    return text;
  });

/** Mostly only the unit, so that layouts are detected; sometimes stated layouts, columns and limits. */
const readOptions: fc.Arbitrary<ParseSpectrumTextOptions> = fc.oneof(
  {
    weight: 3,
    arbitrary: fc.record({
      xUnit: fc.constantFrom<"pixel" | "nm" | undefined>("pixel", undefined),
    }),
  },
  {
    weight: 1,
    arbitrary: fc.record(
      {
        xUnit: fc.constantFrom<"pixel" | "nm" | undefined>("pixel", "nm", undefined),
        delimiter: fc.constantFrom<ParseSpectrumTextOptions["delimiter"]>(
          "comma",
          "semicolon",
          "tab",
          "whitespace",
        ),
        decimalSeparator: fc.constantFrom<"." | ",">(".", ","),
        xColumn: fc.constantFrom(1, 2, 3),
        yColumn: fc.constantFrom(2, 1),
        skipLines: fc.constantFrom(0, 1, 2),
        maxPoints: fc.constantFrom(10, 30, 2_000_000),
        minPoints: fc.constantFrom(2, 16),
      },
      { requiredKeys: ["xUnit"] },
    ),
  },
);

describe("row scanner against the line reader", () => {
  it("gives the same spectrum, or the same error at the same line and column, on random odd texts", () => {
    fc.assert(
      fc.property(oddText, readOptions, (text, options) => {
        if ((options.xColumn ?? 1) === (options.yColumn ?? 2)) return;
        const scanned = outcome(text, options);
        const byLines = outcome(text, { ...options, rowReader: "lines" });
        expect(scanned).toEqual(byLines);
        expectSameSigns(scanned, byLines);
      }),
      { numRuns: 1500 },
    );
  });

  it("agrees on the benchmark's kind of file at a size that forces its arrays to grow", () => {
    const rows = ["pixel,counts"];
    for (let i = 0; i < 20_000; i++)
      rows.push(`${i},${(1000 + 500 * Math.sin(i / 37)).toFixed(2)}`);
    const text = rows.join("\n");
    const scanned = parseSpectrumText(text);
    const byLines = parseSpectrumText(text, { rowReader: "lines" });
    expect(scanned.x.length).toBe(20_000);
    expect(Array.from(scanned.x)).toEqual(Array.from(byLines.x));
    expect(Array.from(scanned.y)).toEqual(Array.from(byLines.y));
    expect(scanned.meta).toEqual(byLines.meta);
  });
});

describe("rowReader option", () => {
  it("is checked on entry", () => {
    expect(() => parseSpectrumText("1,2\n", { rowReader: "fast" as "scan" })).toThrow(RangeError);
  });
});

describe("scanDataRows", () => {
  it("reads plain rows itself, with every number equal to Number() of its cell", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(
          ["comma", ",", "."],
          ["semicolon", ";", ","],
          ["tab", "\t", "."],
          ["whitespace", "  ", ","],
        ),
        fc.array(
          fc.tuple(
            fc.double({ noNaN: true, noDefaultInfinity: true }),
            fc.double({ noNaN: true, noDefaultInfinity: true }),
          ),
          {
            minLength: 1,
            maxLength: 50,
          },
        ),
        fc.constantFrom("\n", "\r\n"),
        ([delimiter, separator, decimal], points, ending) => {
          const cell = (v: number) => (decimal === "," ? String(v).replace(".", ",") : String(v));
          const text =
            points.map(([x, y]) => `${cell(x)}${separator}${cell(y)}`).join(ending) + ending;
          const rows = scanDataRows(text, {
            delimiter: delimiter as "comma",
            decimalSeparator: decimal as ".",
            firstLine: 3,
          });
          expect(rows).not.toBeNull();
          // Number() of the cell is what the line reader gives (String(v) round-trips, so Number gives v)
          points.forEach(([x, y], i) => {
            expect(Object.is(rows!.x[i], Number(String(x)))).toBe(true);
            expect(Object.is(rows!.y[i], Number(String(y)))).toBe(true);
            expect(rows!.lines[i]).toBe(3 + i);
          });
        },
      ),
      { numRuns: 300 },
    );
  });

  it("builds short decimals exactly as Number() rounds them, sign of zero included", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("", "-", "+"),
        fc.stringMatching(/^[0-9]{0,9}$/),
        fc.stringMatching(/^[0-9]{0,9}$/),
        (sign, whole, fraction) => {
          if (whole.length + fraction.length === 0) return;
          const cell = `${sign}${whole}.${fraction}`;
          const rows = scanDataRows(`${cell},1\n`);
          expect(rows).not.toBeNull();
          expect(Object.is(rows!.x[0], Number(cell))).toBe(true);
        },
      ),
      { numRuns: 500 },
    );
  });

  it("skips blank and comment lines, counting them in the line numbers", () => {
    const rows = scanDataRows("1,2\n\n# c\n% c\n// c\n; c\n  \r\n3,4\r\n5,6", { firstLine: 10 });
    expect(rows && Array.from(rows.lines)).toEqual([10, 17, 18]);
    expect(rows && Array.from(rows.y)).toEqual([2, 4, 6]);
  });

  it("hands back anything the line reader treats specially", () => {
    for (const text of [
      '"1",2\n',
      "1,\n",
      "1,2,3\n",
      "1\n",
      "1,2\r3,4\n",
      "1,x\n",
      "1,2\u00a0\n",
      "# c\rd\n1,2\n",
      "1e400,2\n",
      ",1,2\n",
    ]) {
      expect(scanDataRows(text)).toBeNull();
    }
    expect(scanDataRows("1,2\n3,4\n", { maxRows: 1 })).toBeNull();
  });

  it("rejects impossible options with RangeErrors", () => {
    expect(() => scanDataRows("1,2", { xIndex: 2 })).toThrow(RangeError);
    expect(() => scanDataRows("1,2", { xIndex: 1, yIndex: 1 })).toThrow(RangeError);
    expect(() => scanDataRows("1,2", { start: -1 })).toThrow(RangeError);
    expect(() => scanDataRows("1,2", { delimiter: "pipe" as "comma" })).toThrow(RangeError);
  });
});
