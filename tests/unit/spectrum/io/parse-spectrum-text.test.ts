// Checks the two-column text reader: every layout it must detect, unit handling, and each error with its location.
import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import {
  SpectrumParseError,
  decodeSpectrumBytes,
  parseSpectrumText,
  suggestXUnit,
  type ParseSpectrumTextOptions,
  type SpectrumParseErrorCode,
} from "../../../../lib/spectrum/io";

const FIXTURES = path.resolve(__dirname, "../../../fixtures/spectra");
/** The y values the fixture files hold: 200 + 5000·exp(−((i − 10)/2)²), rounded. */
const FIXTURE_Y = [
  200, 200, 200, 200, 201, 210, 292, 727, 2039, 4094, 5200, 4094, 2039, 727, 292, 210, 201, 200,
  200, 200, 200, 200, 200, 200,
];

const N = 20;
const truthX = Array.from({ length: N }, (_, i) => 400 + i * 0.25);
const truthY = Array.from({ length: N }, (_, i) => 1000 + 37 * i - 0.5);

function body(separator: string, decimal: "." | ",", eol = "\n"): string {
  const cell = (value: number) =>
    decimal === "," ? String(value).replace(".", ",") : String(value);
  return truthX.map((x, i) => `${cell(x)}${separator}${cell(truthY[i])}`).join(eol) + eol;
}

function expectTruth(text: string, options: ParseSpectrumTextOptions = {}) {
  const spectrum = parseSpectrumText(text, options);
  expect(Array.from(spectrum.x)).toEqual(truthX);
  expect(Array.from(spectrum.y)).toEqual(truthY);
  return spectrum;
}

function expectError(
  text: string,
  code: SpectrumParseErrorCode,
  line: number | null,
  column: number | null,
  options: ParseSpectrumTextOptions = {},
) {
  let caught: unknown;
  try {
    parseSpectrumText(text, options);
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(SpectrumParseError);
  const error = caught as SpectrumParseError;
  expect({ code: error.code, line: error.line, column: error.column }).toEqual({
    code,
    line,
    column,
  });
  if (line !== null) expect(error.message).toContain(`Line ${line}`);
  return error;
}

describe("layouts", () => {
  const separators = [
    ["comma", ","],
    ["comma and space", ", "],
    ["semicolon", ";"],
    ["tab", "\t"],
    ["spaces", "   "],
    ["tab and spaces", " \t "],
  ] as const;
  const decimals = [".", ","] as const;
  const headers = [
    ["no header", ""],
    ["header", "wavelength (nm)SEPcounts\n"],
    ["commented header", "# wavelength (nm)SEPcounts\n"],
  ] as const;
  for (const [separatorName, separator] of separators) {
    for (const decimal of decimals) {
      // A comma cannot be both the separator and the decimal mark in unquoted cells.
      if (decimal === "," && separator.includes(",")) continue;
      for (const [headerName, header] of headers) {
        for (const eol of ["\n", "\r\n"]) {
          it(`${separatorName}, decimal "${decimal}", ${headerName}, ${eol === "\n" ? "LF" : "CRLF"}`, () => {
            const headerText = header.replace("SEP", separator).replace("\n", eol);
            const options: ParseSpectrumTextOptions = header === "" ? { xUnit: "nm" } : {};
            const spectrum = expectTruth(headerText + body(separator, decimal, eol), options);
            expect(spectrum.xUnit).toBe("nm");
            expect(spectrum.meta.decimalSeparator).toBe(decimal);
            expect(spectrum.meta.xUnitSource).toBe(header === "" ? "caller" : "file");
          });
        }
      }
    }
  }

  it("skips BOM, blank lines and every comment marker", () => {
    const text =
      "\uFEFF# one\n% two\n// three\n; four\n\n  \nx (nm),y\n" +
      body(",", ".").replace("\n", "\n\n# mid-file note\n");
    const spectrum = expectTruth(text);
    expect(spectrum.meta.comments).toBe("# one\n% two\n// three\n; four");
  });

  it("reads a trailing separator on every row as no extra column", () => {
    expectTruth(body(";", ",").replace(/\n/g, ";\n"), { xUnit: "nm" });
  });

  it("reads quoted cells through the CSV parser", () => {
    const text = truthX
      .map((x, i) => `"${String(x).replace(".", ",")}";"${String(truthY[i]).replace(".", ",")}"`)
      .join("\n");
    expectTruth(text, { xUnit: "nm" });
  });

  it("honours a stated delimiter and decimal separator", () => {
    expectTruth(body(";", ","), { xUnit: "nm", delimiter: "semicolon", decimalSeparator: "," });
  });

  it("skips a preamble when told how many lines it has", () => {
    expectTruth("Instrument: bench 7\nIntegration: 100 ms\n" + body("\t", "."), {
      xUnit: "nm",
      skipLines: 2,
    });
  });

  it("reverses a file whose x runs downward", () => {
    const lines = body(",", ".").trim().split("\n").reverse().join("\n");
    const spectrum = expectTruth("Wavelength (nm),Counts\n" + lines);
    expect(spectrum.meta.xReversed).toBe("true");
  });

  it("reads the x and y columns the caller names from a three-column factory file", () => {
    const text = readFileSync(path.join(FIXTURES, "factory-three-columns.csv"), "utf8");
    const byPixel = parseSpectrumText(text);
    expect(byPixel.xUnit).toBe("pixel");
    expect(Array.from(byPixel.x)).toEqual(FIXTURE_Y.map((_, i) => i));
    const byWavelength = parseSpectrumText(text, { xColumn: 2, yColumn: 3 });
    expect(byWavelength.xUnit).toBe("nm");
    expect(byWavelength.x[3]).toBeCloseTo(350 + 0.21 * 3 + 1e-5 * 9, 4);
    expect(Array.from(byWavelength.y)).toEqual(FIXTURE_Y);
    expect(byWavelength.meta.xLabel).toBe("Wavelength [nm]");
  });
});

describe("units from the header", () => {
  const cases: [string, string, number][] = [
    ["pixel", "pixel", 1],
    ["Pixels", "pixel", 1],
    ["wavelength (nm)", "nm", 1],
    ["Wavelength [nm]", "nm", 1],
    ["lambda/Å", "angstrom", 1],
    ["lambda/\u212b", "angstrom", 1],
    ["Wavelength (A)", "angstrom", 1],
    ["Angstrom", "angstrom", 1],
    ["wavenumber / cm-1", "wavenumber", 1],
    ["1/cm", "wavenumber", 1],
    ["Raman shift (cm⁻¹)", "wavenumber", 1],
    ["wavelength (µm)", "nm", 1000],
  ];
  for (const [label, unit, scale] of cases) {
    it(`"${label}" → ${unit}`, () => {
      const spectrum = parseSpectrumText(`${label}\tcounts\n${body("\t", ".")}`);
      expect(spectrum.xUnit).toBe(unit);
      expect(spectrum.x[1]).toBeCloseTo(truthX[1] * scale, 9);
    });
  }

  it("reads air or vacuum from the header and from the caller", () => {
    expect(parseSpectrumText(`Wavelength (nm, air),I\n${body(",", ".")}`).medium).toBe("air");
    expect(parseSpectrumText(`wavelength vac (nm),I\n${body(",", ".")}`).medium).toBe("vacuum");
    expect(parseSpectrumText(body(",", "."), { xUnit: "nm", medium: "vacuum" }).medium).toBe(
      "vacuum",
    );
    expect(
      parseSpectrumText(`pixel,I\n${body(",", ".")}`, { medium: "air" }).medium,
    ).toBeUndefined();
  });

  it("reads the unit from the whole header when its cells do not line up", () => {
    expect(
      parseSpectrumText(`wavelength (nm)   intensity (counts)\n${body("  ", ".")}`).xUnit,
    ).toBe("nm");
  });

  it("asks for the unit when neither the file nor the caller gives it, naming no option", () => {
    const error = expectError(body(",", "."), "unit-unknown", null, null);
    expect(error.message).toBe("the file does not say what its first column holds");
    expectError(`wavelength,counts\n${body(",", ".")}`, "unit-unknown", 1, 1);
    expectError(`x,y\n${body(",", ".")}`, "unit-unknown", 1, 1);
  });

  it("mentions the pixel suggestion but does not act on it", () => {
    const pixels = Array.from({ length: 20 }, (_, i) => `${i} ${i * 3}`).join("\n");
    const error = expectError(pixels, "unit-unknown", null, null);
    expect(error.message).toBe(
      "the file does not say what its first column holds; the values are the integers 0 to 19 in steps of 1, as pixel indices would be",
    );
  });

  it("refuses a caller's unit that contradicts the header, saying which statement it contradicts", () => {
    const unit = expectError(`wavelength (nm),counts\n${body(",", ".")}`, "unit-conflict", 1, 1, {
      xUnit: "pixel",
    });
    expect(unit.stated).toBe("xUnit");
    const medium = expectError(
      `wavelength (nm, air)\tcounts\n${body("\t", ".")}`,
      "unit-conflict",
      1,
      1,
      { medium: "vacuum" },
    );
    expect(medium.stated).toBe("medium");
    expectError(`nm / cm-1,counts\n${body(",", ".")}`, "unit-unknown", 1, 1);
  });
});

describe("suggestXUnit", () => {
  it("suggests pixel for 0..N−1 and 1..N in either direction, nothing otherwise", () => {
    expect(suggestXUnit(Float64Array.from([0, 1, 2, 3]))?.unit).toBe("pixel");
    expect(suggestXUnit(Float64Array.from([1, 2, 3, 4]))?.unit).toBe("pixel");
    expect(suggestXUnit(Float64Array.from([3, 2, 1, 0]))?.unit).toBe("pixel");
    expect(suggestXUnit(Float64Array.from([400, 401, 402, 403]))).toBeNull();
    expect(suggestXUnit(Float64Array.from([0, 1, 2.5, 3]))).toBeNull();
    expect(suggestXUnit(Float64Array.from([0, 2, 4, 6]))).toBeNull();
  });
});

describe("errors name the line and column", () => {
  const header = "wavelength (nm),counts\n";
  const rows = body(",", ".").split("\n");
  const withRow = (index: number, row: string) =>
    header + rows.map((r, i) => (i === index ? row : r)).join("\n");

  it("non-numeric cell", () => {
    const error = expectError(withRow(12, "403,12a.5"), "non-numeric", 14, 2);
    expect(error.message).toBe('Line 14, column 2: "12a.5" is not a number');
  });
  it("non-numeric x", () => expectError(withRow(3, "40O.75,1"), "non-numeric", 5, 1));
  it("hints at the decimal separator", () => {
    const text = "Wavelength (nm);counts\n" + body(";", ",").replace("401,25", "401.25");
    expect(expectError(text, "non-numeric", 7, 1).message).toMatch(/decimal separator is ","/);
  });
  it("empty cell", () => expectError(withRow(4, "401,,5"), "column-count", 6, 3));
  it("empty cell in a used column", () => expectError(withRow(4, ",5"), "empty-cell", 6, 1));
  it("NaN", () => expectError(withRow(2, "400.5,NaN"), "not-finite", 4, 2));
  it("Infinity", () => expectError(withRow(2, "Infinity,5"), "not-finite", 4, 1));
  it("overflow", () => expectError(withRow(2, "400.5,1e999"), "not-finite", 4, 2));
  it("too few points, stating the minimum", () => {
    const error = expectError(header + rows.slice(0, 10).join("\n"), "too-few-points", null, null);
    expect(error.message).toMatch(/at least 16/);
    expect(
      parseSpectrumText(header + rows.slice(0, 10).join("\n"), { minPoints: 10 }).x.length,
    ).toBe(10);
  });
  it("duplicate x", () => expectError(withRow(6, "401.25,9"), "duplicate-x", 8, 1));
  it("non-monotonic x", () => expectError(withRow(6, "400.1,9"), "non-monotonic-x", 8, 1));
  it("missing column", () => expectError(withRow(9, "402.25"), "column-count", 11, 2));
  it("extra column", () => expectError(withRow(9, "402.25,5,6"), "column-count", 11, 3));
  it("a single-column file", () =>
    expectError("1\n2\n3\n".repeat(8), "column-count", 1, null, { xUnit: "pixel" }));
  it("an asked-for column that is not there", () =>
    expectError(body(",", "."), "column-count", 1, null, { xUnit: "nm", yColumn: 3 }));
  it("semicolon-led row in a semicolon file is data, not a comment", () => {
    const text = "wavelength (nm);counts\n" + body(";", ",").replace("401,25;", ";");
    expect(expectError(text, "empty-cell", 7, 1).message).toMatch(/comment only when/);
  });
  it("empty text, comments only, header only", () => {
    expectError("", "empty", null, null);
    expectError("# nothing\n\n", "empty", null, null);
    expectError("wavelength (nm),counts\n", "empty", null, null);
  });
  it("text over the byte limit", () =>
    expectError(body(",", "."), "too-large", null, null, { xUnit: "nm", maxBytes: 100 }));
  it("byte limit counts UTF-8 bytes, not characters", () => {
    const text = "# " + "Å".repeat(200) + "\n" + body(",", ".");
    const bytes = new TextEncoder().encode(text).length;
    expectError(text, "too-large", null, null, { xUnit: "nm", maxBytes: bytes - 1 });
    expect(parseSpectrumText(text, { xUnit: "nm", maxBytes: bytes }).x.length).toBe(N);
  });
  it("points over the point limit", () =>
    expectError(header + body(",", "."), "too-large", 19, null, { maxPoints: 17 }));
  it("caller mistakes are RangeErrors", () => {
    expect(() => parseSpectrumText(body(",", "."), { xColumn: 0 })).toThrow(RangeError);
    expect(() => parseSpectrumText(body(",", "."), { xColumn: 2, yColumn: 2 })).toThrow(RangeError);
    expect(() => parseSpectrumText(body(",", "."), { xUnit: "inch" as never })).toThrow(RangeError);
  });
});

describe("fixtures", () => {
  const read = (name: string) => readFileSync(path.join(FIXTURES, name), "utf8");
  it("semicolon, decimal comma, CRLF, BOM, nm header", () => {
    const spectrum = parseSpectrumText(read("semicolon-decimal-comma-nm.csv"));
    expect(spectrum.xUnit).toBe("nm");
    expect(spectrum.x[1]).toBeCloseTo(400.25, 12);
    expect(Array.from(spectrum.y)).toEqual(FIXTURE_Y);
  });
  it("tab, decimal comma, no header: needs the caller's unit", () => {
    expect(() => parseSpectrumText(read("tab-decimal-comma-no-header.txt"))).toThrow(
      SpectrumParseError,
    );
    const spectrum = parseSpectrumText(read("tab-decimal-comma-no-header.txt"), {
      xUnit: "nm",
      medium: "air",
    });
    expect(spectrum.x[23]).toBeCloseTo(405.75, 12);
    expect(spectrum.medium).toBe("air");
  });
  it("pixels with a commented header", () => {
    const spectrum = parseSpectrumText(read("pixel-whitespace-commented-header.txt"));
    expect(spectrum.xUnit).toBe("pixel");
    expect(Array.from(spectrum.y)).toEqual(FIXTURE_Y);
  });
  it("descending wavenumbers come back increasing", () => {
    const spectrum = parseSpectrumText(read("wavenumber-descending.csv"));
    expect(spectrum.xUnit).toBe("wavenumber");
    expect(spectrum.x[0]).toBe(25000 - 23 * 10);
    expect(Array.from(spectrum.y)).toEqual([...FIXTURE_Y].reverse());
  });
  it("an ångström header in Windows-1252 bytes survives decoding", () => {
    const bytes = new Uint8Array(readFileSync(path.join(FIXTURES, "angstrom-latin1.txt")));
    const spectrum = parseSpectrumText(decodeSpectrumBytes(bytes));
    expect(spectrum.xUnit).toBe("angstrom");
    expect(spectrum.meta.xLabel).toBe("lambda/Å");
    expect(spectrum.x[0]).toBe(5890);
  });
});

describe("size", () => {
  it("reads 1,000,000 rows", () => {
    const rows: string[] = ["pixel\tcounts"];
    for (let i = 0; i < 1_000_000; i++) rows.push(`${i}\t${(i * 7) % 1000}`);
    const spectrum = parseSpectrumText(rows.join("\n"));
    expect(spectrum.x.length).toBe(1_000_000);
    expect(spectrum.x[999_999]).toBe(999_999);
    expect(spectrum.y[999_999]).toBe((999_999 * 7) % 1000);
  });
});
