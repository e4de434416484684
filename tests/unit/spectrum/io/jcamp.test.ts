// Checks the JCAMP-DX reader and writer: compressed and (XY..XY) forms, factors, units, errors, and round trips.
import { describe, it, expect } from "vitest";
import { readFileSync } from "node:fs";
import path from "node:path";
import {
  SpectrumParseError,
  formatJcampDx,
  parseJcamp,
  type SpectrumParseErrorCode,
} from "../../../../lib/spectrum/io";
import type { Spectrum } from "../../../../lib/spectrum/types";

const FIXTURES = path.resolve(__dirname, "../../../fixtures/spectra");
const read = (name: string) => readFileSync(path.join(FIXTURES, name), "utf8");

function codeOf(run: () => unknown): {
  code: SpectrumParseErrorCode;
  line: number | null;
  column: number | null;
} {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(SpectrumParseError);
    const e = error as SpectrumParseError;
    return { code: e.code, line: e.line, column: e.column };
  }
  throw new Error("expected a SpectrumParseError");
}

describe("reading", () => {
  it("decodes a hand-encoded SQZ/DIF/DUP block and applies XFACTOR, YFACTOR and FIRSTX", () => {
    // The y values encoded by hand per the JCAMP-DX ASDF rules (McDonald & Wilks 1988), times YFACTOR = 2
    const expectedY = [50, 55, 60, 65, 65, 65, 62, 59, 56, 53, 50, 50, 50, 50, 50, 50].map(
      (v) => v * 2,
    );
    const spectrum = parseJcamp(read("lamp-difdup-compressed.jdx"));
    expect(Array.from(spectrum.y)).toEqual(expectedY);
    expect(Array.from(spectrum.x)).toEqual(expectedY.map((_, i) => 500 + 0.5 * i));
    expect(spectrum.xUnit).toBe("nm");
    expect(spectrum.medium).toBe("air");
    expect(spectrum.meta.TITLE).toBe("Hand-encoded DIFDUP test block (invented data)");
    expect(spectrum.meta.ORIGIN).toBe("Emberline test fixtures");
    expect(spectrum.meta.OWNER).toBe("PUBLIC DOMAIN");
    expect(spectrum.meta.DATE).toBe("2024/03/05");
  });

  it("reads XYPOINTS=(XY..XY) in wavenumbers, applies the factors and returns x increasing", () => {
    const spectrum = parseJcamp(read("wavenumber-xypoints.jdx"));
    expect(spectrum.xUnit).toBe("wavenumber");
    expect(spectrum.medium).toBeUndefined();
    expect(spectrum.x[0]).toBe(16850);
    expect(spectrum.x[15]).toBe(17000);
    expect(spectrum.y[0]).toBe(16);
    expect(spectrum.y[15]).toBe(1);
    expect(spectrum.meta.xReversed).toBe("true");
  });

  it("asks for the unit when XUNITS is ARBITRARY UNITS, and takes the caller's", () => {
    const text = read("arbitrary-units-peak-table.jdx");
    expect(codeOf(() => parseJcamp(text))).toEqual({ code: "unit-unknown", line: 6, column: null });
    const spectrum = parseJcamp(text, { xUnit: "pixel" });
    expect(spectrum.xUnit).toBe("pixel");
    expect(spectrum.y[15]).toBe(35);
  });

  // x = 0 is no wavelength and no wavenumber (the reader refuses it), so these read the fixture's x 0–15 as 1–16.
  const withUnits = (units: string) =>
    read("arbitrary-units-peak-table.jdx")
      .replace("##XUNITS=ARBITRARY UNITS", `##XUNITS=${units}`)
      .replace(/^(\d+) (\d+)$/gm, (_, x: string, y: string) => `${Number(x) + 1} ${y}`);
  it.each([
    ["NANOMETERS", "nm", 1],
    ["1/CM", "wavenumber", 1],
    ["ANGSTROMS", "angstrom", 1],
    ["PIXELS", "pixel", 1],
    ["MICROMETERS", "nm", 1000],
  ])("XUNITS=%s → %s", (units, unit, scale) => {
    const spectrum = parseJcamp(withUnits(units));
    expect(spectrum.xUnit).toBe(unit);
    expect(spectrum.x[3]).toBe(4 * scale);
  });

  it("refuses a unit that is not a spectral axis, and a contradicting caller", () => {
    expect(codeOf(() => parseJcamp(withUnits("SECONDS")))).toEqual({
      code: "unit-unknown",
      line: 6,
      column: null,
    });
    expect(codeOf(() => parseJcamp(withUnits("NANOMETERS"), { xUnit: "pixel" })).code).toBe(
      "unit-conflict",
    );
  });
});

describe("errors", () => {
  const difdup = read("lamp-difdup-compressed.jdx");
  it("a character no ASDF form allows, at its line and column", () => {
    expect(codeOf(() => parseJcamp(difdup.replace("1005F5lW%W", "1005F5lWx%W")))).toEqual({
      code: "non-numeric",
      line: 19,
      column: 9,
    });
  });
  it("NPOINTS that disagrees with the data", () => {
    expect(codeOf(() => parseJcamp(difdup.replace("##NPOINTS=16", "##NPOINTS=17")))).toEqual({
      code: "jcamp-structure",
      line: 16,
      column: null,
    });
  });
  it("a first X that disagrees with FIRSTX", () => {
    expect(codeOf(() => parseJcamp(difdup.replace("\n1000E0", "\n1100E0")))).toEqual({
      code: "jcamp-structure",
      line: 18,
      column: 1,
    });
  });
  it("a non-numeric (XY..XY) value, and an x without its y", () => {
    const points = read("wavenumber-xypoints.jdx");
    expect(codeOf(() => parseJcamp(points.replace("1694, 14", "1694, 1q4")))).toEqual({
      code: "non-numeric",
      line: 15,
      column: 27,
    });
    expect(codeOf(() => parseJcamp(points.replace("1694, 14;", "1694;")))).toEqual({
      code: "column-count",
      line: 15,
      column: null,
    });
  });
  it("a duplicated x in (XY..XY), at its line", () => {
    const points = read("wavenumber-xypoints.jdx").replace("1691, 20", "1692, 20");
    expect(codeOf(() => parseJcamp(points))).toEqual({
      code: "duplicate-x",
      line: 16,
      column: null,
    });
  });
  it("no data block, no labels, too few points", () => {
    expect(codeOf(() => parseJcamp("##TITLE=x\n##JCAMP-DX=4.24\n##END=\n")).code).toBe(
      "jcamp-structure",
    );
    expect(codeOf(() => parseJcamp("just text")).code).toBe("jcamp-structure");
    expect(codeOf(() => parseJcamp(difdup, { minPoints: 20 }))).toEqual({
      code: "too-few-points",
      line: 16,
      column: null,
    });
    expect(codeOf(() => parseJcamp(difdup, { maxPoints: 10 })).code).toBe("too-large");
  });
});

describe("writing", () => {
  const evenly: Spectrum = {
    x: Float64Array.from({ length: 40 }, (_, i) => 380 + 0.25 * i),
    y: Float64Array.from(
      { length: 40 },
      (_, i) => Math.round(1000 * Math.exp(-(((i - 20) / 3) ** 2))) - 7,
    ),
    xUnit: "nm",
    medium: "air",
    meta: {},
  };

  it("writes the required JCAMP-DX 4.24 labels, lines of at most 80 characters", () => {
    const text = formatJcampDx(evenly, {
      title: "Hg lamp\nrun 3",
      origin: "Test lab",
      owner: "PUBLIC DOMAIN",
    });
    for (const label of [
      "TITLE=Hg lamp run 3",
      "JCAMP-DX=4.24",
      "DATA TYPE=UV/VIS SPECTRUM",
      "ORIGIN=Test lab",
      "OWNER=PUBLIC DOMAIN",
      "XUNITS=NANOMETERS",
      "YUNITS=",
      "XFACTOR=",
      "YFACTOR=",
      "FIRSTX=380",
      "LASTX=389.75",
      "NPOINTS=40",
      "XYDATA=(X++(Y..Y))",
    ]) {
      expect(text).toContain(`##${label}`);
    }
    expect(text.trimEnd().endsWith("##END=")).toBe(true);
    expect(text.split("\n").every((line) => line.length <= 80)).toBe(true);
  });

  it("reads back an evenly spaced integer spectrum exactly, from compressed DIFDUP lines", () => {
    const text = formatJcampDx(evenly);
    expect(text).toContain("##YFACTOR=1\n");
    const back = parseJcamp(text);
    expect(back.xUnit).toBe("nm");
    expect(back.medium).toBe("air");
    expect(Array.from(back.y)).toEqual(Array.from(evenly.y));
    for (let i = 0; i < 40; i++) expect(Math.abs(back.x[i] - evenly.x[i])).toBeLessThan(1e-9);
    // DIFDUP: each line opens with its X and a SQZ ordinate (a letter), then DIF/DUP pseudo-digits only
    // (JCAMP-DX 4.24, Table VII, as checked against the paper); no blank-separated AFFN ordinates.
    const dataLines = text.slice(text.indexOf("##XYDATA=")).split("\n").slice(1, -2);
    for (const line of dataLines) expect(line).toMatch(/^[\d.]+[@A-Ia-i]\d*[%J-Rj-rS-Zs\d]*$/);
  });

  it("writes non-integer y as integers times a power-of-ten YFACTOR, within half of it", () => {
    const y = Float64Array.from({ length: 32 }, (_, i) => Math.sin(i) * 1234.5678 + 0.001);
    const spectrum: Spectrum = {
      x: Float64Array.from({ length: 32 }, (_, i) => 500 + i),
      y,
      xUnit: "nm",
      meta: {},
    };
    const text = formatJcampDx(spectrum);
    // The finest power of ten that keeps 1234.5678… within 2^30 − 1: 1e-5 (1.2e8 < 1.07e9 < 1.2e9).
    expect(Number(/##YFACTOR=(.*)/.exec(text)?.[1])).toBe(1e-5);
    const back = parseJcamp(text);
    for (let i = 0; i < 32; i++) expect(Math.abs(back.y[i] - y[i])).toBeLessThanOrEqual(0.5e-5);
    // A caller may ask for a coarser step.
    const coarse = formatJcampDx(spectrum, { yResolution: 0.01 });
    expect(/##YFACTOR=(.*)/.exec(coarse)?.[1]).toBe("0.01");
  });

  it("writes an unevenly spaced axis as XYPOINTS that reads back exactly, ångströms as nanometres", () => {
    const x = Float64Array.from({ length: 20 }, (_, i) => 4000 + 3 * i + 0.01 * i * i);
    const y = Float64Array.from({ length: 20 }, (_, i) => i * 1.5 - 3.25);
    const text = formatJcampDx({ x, y, xUnit: "angstrom", meta: { TITLE: "uneven" } });
    expect(text).toContain("##XYPOINTS=(XY..XY)");
    expect(text).toContain("##XUNITS=NANOMETERS");
    expect(text).toContain("##TITLE=uneven");
    const back = parseJcamp(text);
    expect(Array.from(back.x)).toEqual(Array.from(x, (v) => v * 0.1));
    expect(Array.from(back.y)).toEqual(Array.from(y));
    expect(back.xUnit).toBe("nm");
  });

  it("refuses what it cannot write", () => {
    const base: Spectrum = {
      x: Float64Array.from([1, 2, 3]),
      y: Float64Array.from([1, 2, 3]),
      xUnit: "nm",
      meta: {},
    };
    expect(() => formatJcampDx({ ...base, x: Float64Array.from([1, 3, 2]) })).toThrow(RangeError);
    expect(() => formatJcampDx({ ...base, y: Float64Array.from([1, NaN, 3]) })).toThrow(RangeError);
    expect(() =>
      formatJcampDx({ ...base, x: Float64Array.from([1, 2, 4]) }, { form: "XYDATA" }),
    ).toThrow(RangeError);
    // JCAMP-DX 4.24 names no unit for detector pixels, nor ##YUNITS=COUNTS (from memory).
    expect(() => formatJcampDx({ ...base, xUnit: "pixel" })).toThrow(/no unit for detector pixels/);
    expect(() => formatJcampDx(base, { yUnits: "COUNTS" as unknown as "ARBITRARY UNITS" })).toThrow(
      /not one of the standard's/,
    );
    // One label, once: the writer's ##$MEDIUM cannot be repeated by a caller.
    expect(() =>
      formatJcampDx(
        { ...base, medium: "air" },
        { userLabels: [{ name: "$MEDIUM", value: "AIR" }] },
      ),
    ).toThrow(/written twice/);
  });
});
