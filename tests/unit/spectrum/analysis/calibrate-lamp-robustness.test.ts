// No input makes automatic lamp calibration throw anything but a CalibrationError (which the
// services map to a 4xx with its sentence): flat spectra, all-saturated lamps, one-pixel lines,
// degenerate peaks, bad options. Property test over arbitrary spectra (FC_SEED explores other seeds).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { calibrateLamp, type CalibrateLampOptions } from "@/lib/spectrum/analysis/calibrate-lamp";
import { CalibrationError, type LampLine } from "@/lib/spectrum/calibration";
import { tableLampLines } from "../../../support/realistic-lamp";

const LINES: LampLine[] = tableLampLines(["Hg", "Ar"], [350, 900]);
const OPTIONS: CalibrateLampOptions = {
  nominalRangeNm: [350, 900],
  dispersion: "grating",
  resolutionNm: 1,
};
const pixels = (n: number) => Float64Array.from({ length: n }, (_, i) => i);

/** Runs the calibration and returns what it threw (undefined when it returned). */
function thrown(
  x: Float64Array,
  y: Float64Array,
  lines: LampLine[],
  options: CalibrateLampOptions,
): unknown {
  try {
    calibrateLamp(x, y, lines, options);
    return undefined;
  } catch (error) {
    return error;
  }
}

describe("calibrateLamp on hostile input", () => {
  it.each([
    ["a flat spectrum", () => new Float64Array(2048).fill(500)],
    ["an all-zero spectrum", () => new Float64Array(2048)],
    ["an all-saturated lamp", () => new Float64Array(2048).fill(65535)],
    [
      "one-pixel lines only (hot pixels)",
      () => Float64Array.from({ length: 2048 }, (_, i) => (i % 97 === 0 ? 60000 : 300)),
    ],
    [
      "a saturated plateau over half the array",
      () =>
        Float64Array.from({ length: 2048 }, (_, i) =>
          i > 500 && i < 1500 ? 65535 : 200 + (i % 7),
        ),
    ],
    [
      "two-pixel-wide identical peaks",
      () => Float64Array.from({ length: 2048 }, (_, i) => (i % 50 < 2 ? 5000 : 100)),
    ],
  ])("%s: returns needs-manual or throws a CalibrationError", (_, make) => {
    for (const dispersion of ["grating", "prism"] as const) {
      const error = thrown(pixels(2048), make(), LINES, { ...OPTIONS, dispersion });
      if (error !== undefined) expect(error).toBeInstanceOf(CalibrationError);
    }
  });

  it("refuses bad input with code invalid-input and a sentence", () => {
    const y = new Float64Array(2048).fill(1);
    const cases: [Float64Array, Float64Array, LampLine[], CalibrateLampOptions][] = [
      [pixels(10), new Float64Array(10), LINES, OPTIONS],
      [pixels(2048), new Float64Array(2047), LINES, OPTIONS],
      [pixels(2048), Float64Array.from(y, (v, i) => (i === 5 ? Number.NaN : v)), LINES, OPTIONS],
      [Float64Array.from({ length: 2048 }, (_, i) => 2048 - i), y, LINES, OPTIONS],
      [pixels(2048), y, LINES, { ...OPTIONS, nominalRangeNm: [900, 350] }],
      [pixels(2048), y, LINES, { ...OPTIONS, resolutionNm: -1 }],
      [pixels(2048), y, LINES, { ...OPTIONS, dispersion: "mirror" as never }],
      [
        pixels(2048),
        y,
        [{ wavelengthNm: Number.NaN, intensity: 1, species: "Hg I", id: "x" }],
        OPTIONS,
      ],
    ];
    for (const [x, yy, lines, options] of cases) {
      const error = thrown(x, yy, lines, options);
      expect(error).toBeInstanceOf(CalibrationError);
      expect((error as CalibrationError).code).toBe("invalid-input");
      expect((error as CalibrationError).message.length).toBeGreaterThan(20);
    }
  });

  it("never throws anything but a CalibrationError on arbitrary spectra", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 16, max: 600 }),
        fc.array(
          fc.tuple(
            fc.double({ min: 0, max: 1, noNaN: true }),
            fc.double({ min: 0, max: 70000, noNaN: true }),
            fc.integer({ min: 0, max: 4 }),
          ),
          { maxLength: 40 },
        ),
        fc.double({ min: -100, max: 1000, noNaN: true }),
        fc.option(fc.double({ min: 50, max: 65535, noNaN: true }), { nil: undefined }),
        fc.constantFrom("grating" as const, "prism" as const),
        fc.tuple(
          fc.double({ min: 150, max: 600, noNaN: true }),
          fc.double({ min: 20, max: 800, noNaN: true }),
        ),
        (n, lines, floor, clip, dispersion, [low, span]) => {
          const y = new Float64Array(n).fill(floor);
          for (const [at, height, halfWidth] of lines) {
            const c = Math.floor(at * (n - 1));
            for (let i = Math.max(0, c - halfWidth); i <= Math.min(n - 1, c + halfWidth); i++)
              y[i] += height;
          }
          if (clip !== undefined) for (let i = 0; i < n; i++) y[i] = Math.min(y[i], clip);
          const error = thrown(
            pixels(n),
            y,
            tableLampLines(["Hg", "Ne", "Ar"], [low, low + span]),
            {
              nominalRangeNm: [low, low + span],
              dispersion,
              resolutionNm: span / 400,
            },
          );
          if (error !== undefined) expect(error).toBeInstanceOf(CalibrationError);
        },
      ),
      { numRuns: 60 },
    );
  });
});
