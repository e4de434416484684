// JCAMP-DX as strict readers take it: the strict validator (tests/support, its own code) refuses each
// broken rule, accepts hand-made files of every compression form (each encoding an example the standard
// itself gives), and accepts every export the app writes — even axis, uneven axis, resampled — which also
// read back through the app's reader to the same points within YFACTOR.
import fs from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatRunSpectrumJdx, type RunSpectrumJdxInput } from "@/lib/reports/spectrum-jdx";
import { formatJcampDx, parseJcamp, resampleEvenly } from "@/lib/spectrum/io";
import type { Spectrum } from "@/lib/spectrum/types";
import { validateStrictJcamp } from "../../../support/jcamp-strict-validator";

const FORMS = path.resolve(__dirname, "../../../fixtures/spectra/jcamp-forms");
const read = (name: string) => fs.readFileSync(path.join(FORMS, name), "utf8");

/** A valid 4.24 file around `data`, with header lines replaced or added through `labels`. */
function file(data: string[], labels: Record<string, string | null> = {}): string {
  const header: Record<string, string | null> = {
    TITLE: "strict test (invented data)",
    "JCAMP-DX": "4.24",
    "DATA TYPE": "UV/VIS SPECTRUM",
    ORIGIN: "tests",
    OWNER: "PUBLIC DOMAIN",
    XUNITS: "NANOMETERS",
    YUNITS: "ARBITRARY UNITS",
    XFACTOR: "1",
    YFACTOR: "1",
    FIRSTX: "401",
    LASTX: "410",
    NPOINTS: "10",
    FIRSTY: "1",
    XYDATA: "(X++(Y..Y))",
    ...labels,
  };
  const lines = Object.entries(header)
    .filter(([, value]) => value !== null)
    .map(([name, value]) => `##${name}=${value}`);
  // XYDATA last among the labels, as its data follow it.
  const at = lines.findIndex((l) => l.startsWith("##XYDATA=") || l.startsWith("##XYPOINTS="));
  const table = lines.splice(at, 1);
  return [...lines, ...table, ...data, "##END="].join("\n") + "\n";
}

const TEN = [1, 2, 3, 3, 2, 1, 0, -1, -2, -3];
const VALID_DATA = ["401AJJ%j", "405Bjj", "407@jjj", "410c"];

describe("the strict validator", () => {
  it("accepts a valid file and decodes it on its own", () => {
    const result = validateStrictJcamp(file(VALID_DATA));
    expect(result.problems).toEqual([]);
    expect(result.points?.y).toEqual(TEN);
    expect(result.points?.x).toEqual([401, 402, 403, 404, 405, 406, 407, 408, 409, 410]);
  });

  // Each case breaks one rule of the standard; the validator must name it.
  it.each([
    ["a line over 80 characters", file(VALID_DATA, { TITLE: "x".repeat(100) }), /80 characters/],
    [
      "a character outside printable ASCII",
      file(VALID_DATA, { ORIGIN: "Labor Müller" }),
      /printable ASCII/,
    ],
    ["an ISO date", file(VALID_DATA, { DATE: "2026-03-01T10:15:00.000Z" }), /##DATE=YY\/MM\/DD/],
    ["a time with its zone", file(VALID_DATA, { TIME: "10:15:00Z" }), /##TIME=HH:MM:SS/],
    ["an ISO long date", file(VALID_DATA, { LONGDATE: "2026-03-01T10:15:00Z" }), /LONGDATE/],
    ["COUNTS as YUNITS", file(VALID_DATA, { YUNITS: "COUNTS" }), /YUNITS from the standard's list/],
    [
      "ANGSTROMS as XUNITS",
      file(VALID_DATA, { XUNITS: "ANGSTROMS" }),
      /XUNITS from the standard's list/,
    ],
    ["PIXELS as XUNITS", file(VALID_DATA, { XUNITS: "PIXELS" }), /XUNITS from the standard's list/],
    ["a missing ORIGIN", file(VALID_DATA, { ORIGIN: null }), /required labels.*ORIGIN/],
    ["a missing FIRSTY", file(VALID_DATA, { FIRSTY: null }), /required labels.*FIRSTY/],
    ["a JavaScript exponent", file(VALID_DATA, { YFACTOR: "1e-7" }), /AFFN/],
    ["an NPOINTS that disagrees", file(VALID_DATA, { NPOINTS: "11" }), /NPOINTS counts the points/],
    ["a FIRSTY that disagrees", file(VALID_DATA, { FIRSTY: "2" }), /FIRSTY/],
    ["a failed Y check", file(["401AJJ%j", "405Cjj", "407@jjj", "410c"]), /Y check/],
    ["a line's X off by a step", file(["401AJJ%j", "406Bjj", "407@jjj", "410c"]), /X check/],
    [
      "an ordinate beyond 32 bits",
      file(["401 3000000000 1 1 1 1 1 1 1 1 1"], { FIRSTY: "3000000000" }),
      /32 bits/,
    ],
    [
      "a DIF value opening a line",
      file(["401JJJ%j", "405Bjj", "407@jjj", "410c"]),
      /first ordinate is an actual value/,
    ],
    ["a character no ASDF form has", file(["401 1 2 3 3 2 1 0 -1 -2 #"]), /no ASDF character/],
  ])("refuses %s", (_, text, rule) => {
    const { problems } = validateStrictJcamp(text);
    expect(
      problems.some((p) => rule.test(p)),
      problems.join("\n"),
    ).toBe(true);
  });

  it("refuses a label repeated in the block, such as the medium stated twice", () => {
    const text = file(VALID_DATA, { $MEDIUM: "AIR" }).replace(
      "##$MEDIUM=AIR",
      "##$MEDIUM=AIR\n##$ MEDIUM=AIR",
    );
    expect(validateStrictJcamp(text).problems.join("\n")).toMatch(/each label once/);
  });

  it("refuses a file that does not open with ##TITLE= or goes on after ##END=", () => {
    const text = file(VALID_DATA);
    expect(validateStrictJcamp(`##ORIGIN=x\n${text}`).problems.join("\n")).toMatch(
      /##TITLE= first/,
    );
    expect(validateStrictJcamp(`${text}401 1\n`).problems.join("\n")).toMatch(/after ##END=/);
  });
});

describe("files of every compression form, as other writers make them", () => {
  // The ten ordinates of the example of Table VII of JCAMP-DX 4.24 (McDonald & Wilks 1988), each file
  // in one ASDF form (sec. 5.3–5.10); as checked against the paper.
  it.each(["affn.jdx", "pac.jdx", "sqz.jdx", "dif.jdx", "sqzdup.jdx", "difdup.jdx"])(
    "%s decodes to the ten ordinates of the standard's example, in the app's reader and the validator",
    (name) => {
      const text = read(name);
      const strict = validateStrictJcamp(text);
      expect(strict.problems).toEqual([]);
      expect(strict.points?.y).toEqual(TEN);
      const spectrum = parseJcamp(text, { minPoints: 4 });
      expect(Array.from(spectrum.y)).toEqual(TEN);
      expect(Array.from(spectrum.x)).toEqual(TEN.map((_, i) => 401 + i));
      expect(spectrum.xUnit).toBe("nm");
    },
  );

  // Sec. 5.9 and 5.10's own example: 50 50 50 50 is 50V in DUP form, 50%%% in DIF, 50%U in DIFDUP.
  it.each(["dup-50.jdx", "dif-50.jdx", "difdup-50.jdx"])("%s decodes to four fifties", (name) => {
    const text = read(name);
    expect(validateStrictJcamp(text).problems).toEqual([]);
    expect(Array.from(parseJcamp(text, { minPoints: 4 }).y)).toEqual([50, 50, 50, 50]);
  });
});

function runInput(wavelengthNm: Float64Array, counts: Float64Array): RunSpectrumJdxInput {
  return {
    wavelengthNm,
    counts,
    medium: "air",
    runId: "0f3c9a12-4b5d-4e6f-8a7b-1c2d3e4f5a6b",
    versionNumber: 12,
    calibrationId: "33333333-4444-4555-8666-777777777777",
    releaseId: "44444444-5555-4666-8777-888888888888",
    releaseNumber: 3,
    sampleSha256: "ab".repeat(32),
    sampleFileName: `a very long file name from a spectrometer's own software ${"é".repeat(40)}.csv`,
    softwareVersion: "0.1.0",
    origin: "Emberline, team Flame Screening of the invented demo laboratory",
    analysedAt: "2026-03-01T10:15:00.000Z",
  };
}

/** A grating's pixel-to-nm mapping: wavelengths unevenly spaced. */
const unevenNm = (n: number) =>
  Float64Array.from({ length: n }, (_, i) => 400 + 0.2 * i + 1e-5 * i * i - 3e-9 * i * i * i);
const lineCounts = (n: number, scale = 1) =>
  Float64Array.from(
    { length: n },
    (_, i) => Math.round(scale * (120 + 15000 * Math.exp(-(((i - n / 3) / 2.5) ** 2)))) + (i % 5),
  );

/** The export passes the strict validator, and both readers return its points within half of YFACTOR. */
function expectStrictRoundTrip(text: string, spectrum: { x: Float64Array; y: Float64Array }) {
  const strict = validateStrictJcamp(text);
  expect(strict.problems).toEqual([]);
  const yFactor = Number(/^##YFACTOR=(.*)$/m.exec(text)![1]);
  const back = parseJcamp(text);
  expect(back.x.length).toBe(spectrum.x.length);
  const step = Math.abs(spectrum.x[1] - spectrum.x[0]);
  for (let i = 0; i < spectrum.x.length; i++) {
    expect(Math.abs(back.y[i] - spectrum.y[i])).toBeLessThanOrEqual(
      yFactor / 2 + 1e-9 * Math.abs(spectrum.y[i]),
    );
    expect(Math.abs(strict.points!.y[i] - spectrum.y[i])).toBeLessThanOrEqual(
      yFactor / 2 + 1e-9 * Math.abs(spectrum.y[i]),
    );
    expect(Math.abs(back.x[i] - spectrum.x[i])).toBeLessThanOrEqual(
      1e-9 * step + 1e-12 * spectrum.x[i],
    );
  }
  return { back, yFactor };
}

describe("every export passes the strict validator and reads back", () => {
  it("the calibrated run spectrum on an uneven axis: XYPOINTS, exactly", () => {
    const x = unevenNm(2048);
    const y = lineCounts(2048);
    const text = formatRunSpectrumJdx(runInput(x, y));
    expect(text).toContain("##XYPOINTS=(XY..XY)");
    const { back } = expectStrictRoundTrip(text, { x, y });
    expect(Array.from(back.x)).toEqual(Array.from(x));
    expect(Array.from(back.y)).toEqual(Array.from(y));
    expect(back.medium).toBe("air");
    // The medium is stated once, the date in the standard's forms.
    expect(text.match(/MEDIUM=/g)).toHaveLength(1);
    expect(text).toContain(
      "##DATE=26/03/01\n##TIME=10:15:00\n##LONGDATE=2026/03/01 10:15:00 +0000\n",
    );
    expect(text).toContain(`##$RAW SHA256=${"ab".repeat(32)}\n`);
  });

  it("the calibrated run spectrum on an even axis: compressed DIFDUP XYDATA of the integer counts", () => {
    const x = Float64Array.from({ length: 3648 }, (_, i) => 350 + 0.15 * i);
    const y = lineCounts(3648);
    const text = formatRunSpectrumJdx(runInput(x, y));
    expect(text).toContain("##XYDATA=(X++(Y..Y))");
    expect(text).toContain("##YFACTOR=1\n");
    const { back } = expectStrictRoundTrip(text, { x, y });
    expect(Array.from(back.y)).toEqual(Array.from(y));
    // Compressed: well under the ~8 characters a point plain AFFN would need.
    const data = text.slice(text.indexOf("##XYDATA="), text.indexOf("##END="));
    expect(data.length / 3648).toBeLessThan(4);
  });

  it("the run spectrum resampled onto an even axis: XYDATA within YFACTOR of the resampled points", () => {
    const x = unevenNm(2048);
    const y = lineCounts(2048);
    const text = formatRunSpectrumJdx(runInput(x, y), { resampleEvenly: true });
    expect(text).toContain("##XYDATA=(X++(Y..Y))");
    expect(text).toContain("##$EMBERLINE RESAMPLED=LINEAR INTERPOLATION ONTO 2048 EVEN STEPS");
    const resampled = resampleEvenly({ x, y, xUnit: "nm", meta: {} });
    const { yFactor } = expectStrictRoundTrip(text, resampled);
    expect(yFactor).toBe(0.001);
    expect(resampled.x[0]).toBe(x[0]);
    expect(resampled.x[2047]).toBe(x[2047]);
  });

  it("counts beyond 32 bits get a YFACTOR that keeps every ordinate and difference within them", () => {
    const x = Float64Array.from({ length: 500 }, (_, i) => 500 + 0.5 * i);
    const y = lineCounts(500, 4e5);
    expect(Math.max(...y)).toBeGreaterThan(2 ** 32);
    const text = formatJcampDx({ x, y, xUnit: "nm", meta: {} });
    const { yFactor } = expectStrictRoundTrip(text, { x, y });
    expect(yFactor).toBe(10);
  });

  it("wavenumbers in 1/CM, ångströms in NANOMETERS, negative and fractional values", () => {
    const x = Float64Array.from({ length: 400 }, (_, i) => 15000 + 2.5 * i);
    const y = Float64Array.from({ length: 400 }, (_, i) => Math.sin(i / 7) * 123.456789 - 40);
    const wavenumbers = formatJcampDx({ x, y, xUnit: "wavenumber", meta: {} });
    expect(wavenumbers).toContain("##XUNITS=1/CM");
    expectStrictRoundTrip(wavenumbers, { x, y });

    const angstroms = formatJcampDx({
      x: unevenNm(300).map((v) => v * 10),
      y: y.slice(0, 300),
      xUnit: "angstrom",
      medium: "vacuum",
      meta: {},
    });
    expect(angstroms).toContain("##XUNITS=NANOMETERS");
    const back = parseJcamp(angstroms);
    expect(validateStrictJcamp(angstroms).problems).toEqual([]);
    expect(back.xUnit).toBe("nm");
    expect(back.medium).toBe("vacuum");
    for (let i = 0; i < 300; i++) expect(back.x[i]).toBeCloseTo(unevenNm(300)[i], 9);
  });

  it("holds for random spectra (fast-check, fixed seed)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 400 }),
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.double({ min: 1e-4, max: 5, noNaN: true }),
        fc.array(fc.double({ min: -1e12, max: 1e12, noNaN: true, noDefaultInfinity: true }), {
          minLength: 400,
          maxLength: 400,
        }),
        fc.boolean(),
        fc.boolean(),
        (n, start, step, values, integers, even) => {
          const x = Float64Array.from({ length: n }, (_, i) =>
            even ? start + i * step : start + i * step + 0.01 * step * Math.sin(i),
          );
          const y = Float64Array.from(values.slice(0, n), (v) => (integers ? Math.round(v) : v));
          const spectrum: Spectrum = { x, y, xUnit: "nm", meta: {} };
          const text = formatJcampDx(spectrum, { date: "2026-01-02T03:04:05Z" });
          const strict = validateStrictJcamp(text);
          expect(strict.problems).toEqual([]);
          const yFactor = Number(/^##YFACTOR=(.*)$/m.exec(text)![1]);
          const back = parseJcamp(text, { minPoints: 2 });
          for (let i = 0; i < n; i++) {
            expect(Math.abs(back.y[i] - y[i])).toBeLessThanOrEqual(
              yFactor / 2 + 1e-9 * Math.abs(y[i]),
            );
          }
        },
      ),
      { numRuns: 150 },
    );
  });
});
