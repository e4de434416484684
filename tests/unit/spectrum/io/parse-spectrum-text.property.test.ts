// Property tests of the text reader: random valid layouts always read back, random damage is always located.
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { TEXT_LAYOUTS } from "../../../support/text-mutations";
import { SpectrumParseError, parseSpectrumText } from "../../../../lib/spectrum/io";

interface Generated {
  text: string;
  x: number[];
  y: number[];
  /** 1-based file line of each data row. */
  lines: number[];
  separator: string;
  decimal: "." | ",";
}

/** Strictly increasing x (positive steps, 3 decimals) and y with up to 3 decimals, in a random layout. */
const spectrumText = fc
  .record({
    layout: fc.constantFrom(...TEXT_LAYOUTS),
    start: fc.integer({ min: 0, max: 100_000 }),
    steps: fc.array(fc.integer({ min: 1, max: 5000 }), { minLength: 16, maxLength: 60 }),
    yMillis: fc.array(fc.integer({ min: -1_000_000, max: 100_000_000 }), {
      minLength: 60,
      maxLength: 60,
    }),
    header: fc.constantFrom("", "wavelength (nm)", "# wavelength (nm)"),
    comments: fc.array(fc.constantFrom("# run 4", "% lamp", "// note", ""), { maxLength: 3 }),
    crlf: fc.boolean(),
    descending: fc.boolean(),
  })
  .map(({ layout, start, steps, yMillis, header, comments, crlf, descending }): Generated => {
    const x: number[] = [];
    let xMillis = start;
    for (const step of steps) {
      xMillis += step;
      x.push(xMillis / 1000);
    }
    const y = x.map((_, i) => yMillis[i] / 1000);
    const cell = (value: number) =>
      layout.decimal === "," ? String(value).replace(".", ",") : String(value);
    const out: string[] = [...comments];
    if (header) out.push(`${header}${layout.separator}counts`);
    const order = x.map((_, i) => i);
    if (descending) order.reverse();
    const lines = new Array<number>(x.length);
    for (const i of order) {
      out.push(`${cell(x[i])}${layout.separator}${cell(y[i])}`);
      lines[i] = out.length;
    }
    return {
      text: out.join(crlf ? "\r\n" : "\n") + "\n",
      x,
      y,
      lines,
      separator: layout.separator,
      decimal: layout.decimal,
    };
  });

function caught(run: () => unknown): SpectrumParseError {
  try {
    run();
  } catch (error) {
    if (error instanceof SpectrumParseError) return error;
    throw error;
  }
  throw new Error("expected a SpectrumParseError");
}

describe("parseSpectrumText properties", () => {
  it("valid random spectra in any layout read back their points", () => {
    fc.assert(
      fc.property(spectrumText, (generated) => {
        const spectrum = parseSpectrumText(generated.text, {
          xUnit: generated.text.includes("(nm)") ? undefined : "nm",
        });
        expect(Array.from(spectrum.x)).toEqual(generated.x);
        expect(Array.from(spectrum.y)).toEqual(generated.y);
      }),
      { numRuns: 150 },
    );
  });

  it("a cell replaced by garbage throws at its line and column", () => {
    fc.assert(
      fc.property(
        spectrumText,
        fc.nat(),
        fc.constantFrom(0, 1),
        fc.constantFrom("12a.5", "abc", "1..2", "--3", "NaN", "Infinity", "0x1F", "1e", "+"),
        (generated, pick, column, garbage) => {
          const row = pick % generated.x.length;
          const fileLines = generated.text.split(/\r?\n/);
          const cells = [generated.x[row], generated.y[row]].map((v) =>
            generated.decimal === "," ? String(v).replace(".", ",") : String(v),
          );
          cells[column] = garbage;
          fileLines[generated.lines[row] - 1] = cells.join(generated.separator);
          const error = caught(() => parseSpectrumText(fileLines.join("\n"), { xUnit: "nm" }));
          expect(error.line).toBe(generated.lines[row]);
          expect(error.column).toBe(column + 1);
          expect(["non-numeric", "not-finite"]).toContain(error.code);
        },
      ),
      { numRuns: 150 },
    );
  });

  it("a duplicated x throws duplicate-x at the second of the two rows", () => {
    fc.assert(
      fc.property(spectrumText, fc.integer({ min: 1, max: 1000 }), (generated, pick) => {
        const row = 1 + (pick % (generated.x.length - 1));
        const fileLines = generated.text.split(/\r?\n/);
        const x = generated.x[row - 1];
        const cell = (v: number) =>
          generated.decimal === "," ? String(v).replace(".", ",") : String(v);
        fileLines[generated.lines[row] - 1] =
          `${cell(x)}${generated.separator}${cell(generated.y[row])}`;
        const error = caught(() => parseSpectrumText(fileLines.join("\n"), { xUnit: "nm" }));
        expect(error.code).toBe("duplicate-x");
        // Rows are written ascending or descending; the later of the two in the file is reported.
        expect(error.line).toBe(Math.max(generated.lines[row], generated.lines[row - 1]));
      }),
      { numRuns: 150 },
    );
  });

  it("a row with a missing column throws column-count at that row", () => {
    fc.assert(
      fc.property(spectrumText, fc.nat(), (generated, pick) => {
        const row = pick % generated.x.length;
        const fileLines = generated.text.split(/\r?\n/);
        const cell =
          generated.decimal === ","
            ? String(generated.x[row]).replace(".", ",")
            : String(generated.x[row]);
        fileLines[generated.lines[row] - 1] = cell;
        const error = caught(() => parseSpectrumText(fileLines.join("\n"), { xUnit: "nm" }));
        const firstDataLine = Math.min(...generated.lines);
        // When the damaged row is the first one, every other row disagrees with it instead.
        const expected =
          generated.lines[row] === firstDataLine ? firstDataLine : generated.lines[row];
        expect(error.code).toBe("column-count");
        expect(error.line).toBe(expected);
      }),
      { numRuns: 150 },
    );
  });
});
