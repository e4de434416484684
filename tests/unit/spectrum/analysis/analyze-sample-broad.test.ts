// Checks, through the whole sample analysis, that a feature several instrument widths wide is taken
// for a band (or left unexplained), never for the atomic line under it, and where the width comes from.
import { describe, it, expect } from "vitest";
import { analyzeSample } from "../../../../lib/spectrum/analysis";
import { fitCalibration } from "../../../../lib/spectrum/calibration";
import { synthesizeSpectrum } from "../../../../lib/spectrum/synthetic";
import type { ReferenceLine } from "../../../../lib/spectrum/types";

const PIXELS = 2048;
/** A linear grating over 400–700 nm: 0.1466 nm per pixel. */
const wavelengthOfPixel = (px: number) => 400 + (300 * px) / (PIXELS - 1);
const NM_PER_PX = 300 / (PIXELS - 1);
const RESOLUTION_NM = 0.6;

// An invented table: five clear lines, an atomic line under each broad feature, and one band.
function line(
  id: string,
  species: string,
  airNm: number,
  extra: Partial<ReferenceLine> = {},
): ReferenceLine {
  return {
    id,
    species,
    element: species.split(" ")[0],
    ionStage: species.includes(" ") ? 1 : null,
    airNm,
    vacuumNm: airNm * 1.00028,
    uncertaintyNm: 0.001,
    intensities: { flame: 100 },
    flags: {},
    ...extra,
  };
}
const CLEAR_NM = [420, 465, 510, 630, 680];
const table: ReferenceLine[] = [
  ...CLEAR_NM.map((nm, i) => line(`a${i}`, "A I", nm)),
  line("x1", "X I", 602.0),
  line("y1", "Y I", 560.0),
  line("xo", "XO", 600, {
    uncertaintyNm: 0.5,
    flags: { bandHead: true },
    band: { extentNm: 20, degradesTo: "red" },
  }),
];

const sample = synthesizeSpectrum({
  pixelCount: PIXELS,
  wavelengthOfPixel,
  resolutionNm: RESOLUTION_NM,
  lines: [
    ...CLEAR_NM.map((wavelengthNm) => ({ wavelengthNm, amplitude: 2000 })),
    // Six instrument widths wide where only Y I lies.
    { wavelengthNm: 560.0, amplitude: 400, fwhmNm: 6 * RESOLUTION_NM },
  ],
  // A band as a band looks, a sharp head fading to the red, with its head in the table's head zone
  // (600–606 nm) and X I under its top.
  bands: [{ headNm: 601, extentNm: 20, degradesTo: "red", amplitude: 400 }],
  readNoiseCounts: 5,
  darkCounts: 100,
  seed: 7,
});
const pairs = [0, 400, 800, 1200, 1600, 2047].map((x) => ({
  x,
  wavelengthNm: wavelengthOfPixel(x),
}));
const calibration = fitCalibration(pairs, {
  model: "polynomial",
  degree: 1,
  domain: [0, PIXELS - 1],
}).model;
const peakNear = (analysis: ReturnType<typeof analyzeSample>, nm: number) => {
  const found = analysis.peaks.findIndex((p) => Math.abs(p.wavelengthNm - nm) < RESOLUTION_NM);
  expect(found, `a peak near ${nm} nm`).toBeGreaterThanOrEqual(0);
  return found;
};

describe("analyzeSample on features much wider than the instrument's line", () => {
  const analysis = analyzeSample(sample.x, sample.y, table, { calibration, source: "flame" });

  it("estimates the instrument's width from the clear lines", () => {
    expect(analysis.instrumentWidth?.basis).toBe("estimated");
    expect(analysis.instrumentWidth?.unit).toBe("px");
    // The lines are drawn 0.6 nm = 4.1 px wide; smoothing and sampling widen what is measured by at most 15 %.
    const truthPx = RESOLUTION_NM / NM_PER_PX;
    expect(analysis.instrumentWidth!.fwhm).toBeGreaterThan(truthPx);
    expect(analysis.instrumentWidth!.fwhm).toBeLessThan(1.15 * truthPx);
  });

  it("keeps the clear lines as lines, each with the instrument's resolution in nm", () => {
    for (const nm of CLEAR_NM) {
      const p = analysis.peaks[peakNear(analysis, nm)];
      expect(p.broad).toBe(false);
      expect(Math.abs(p.resolutionNm! / RESOLUTION_NM - 1)).toBeLessThan(0.15);
      expect(
        analysis.identification.matches[peakNear(analysis, nm)].candidates.map((c) => c.line.id),
      ).toContain(`a${CLEAR_NM.indexOf(nm)}`);
    }
    expect(analysis.identification.calls.find((c) => c.species === "A I")?.verdict).toBe("present");
  });

  it("offers a broad feature only the band whose head zone it lies in", () => {
    const at = peakNear(analysis, 602);
    expect(analysis.peaks[at].broad).toBe(true);
    expect(analysis.identification.matches[at].candidates.map((c) => [c.line.id, c.kind])).toEqual([
      ["xo", "band"],
    ]);
    expect(
      analysis.identification.calls.find((c) => c.species === "X I")?.verdict ?? "absent",
    ).toBe("absent");
  });

  it("lists a broad feature that no band explains among the unexplained peaks", () => {
    const at = peakNear(analysis, 560);
    expect(analysis.peaks[at].broad).toBe(true);
    expect(analysis.identification.matches[at].candidates).toEqual([]);
    expect(analysis.identification.unexplainedPeaks.find((u) => u.peakIndex === at)?.reason).toBe(
      "no-candidate",
    );
    expect(
      analysis.identification.calls.find((c) => c.species === "Y I")?.verdict ?? "absent",
    ).toBe("absent");
  });

  it("converts a given resolutionNm at the array's middle, or takes resolutionPx as it is", () => {
    const fromNm = analyzeSample(sample.x, sample.y, table, {
      calibration,
      resolutionNm: RESOLUTION_NM,
    });
    expect(fromNm.instrumentWidth?.basis).toBe("resolutionNm");
    expect(fromNm.instrumentWidth!.fwhm / (RESOLUTION_NM / NM_PER_PX) - 1).toBeCloseTo(0, 9);
    const fromPx = analyzeSample(sample.x, sample.y, table, { calibration, resolutionPx: 4 });
    expect(fromPx.instrumentWidth).toEqual({ fwhm: 4, unit: "px", basis: "resolutionPx" });
    expect(fromPx.peaks[peakNear(fromPx, 602)].broad).toBe(true);
  });

  it("reads the width along an axis already in nm from its clean lines, and wants a calibration for resolutionPx", () => {
    const x = Float64Array.from(sample.x, wavelengthOfPixel);
    const asNm = analyzeSample(x, sample.y, table, {});
    // A grating: the five clear lines give a flat trend near the 0.6-nm truth (the smoothing
    // widens a 4-sample line by a few per cent).
    expect(asNm.instrumentWidth?.basis).toBe("estimated");
    expect(asNm.instrumentWidth?.unit).toBe("nm");
    expect(asNm.instrumentWidth!.fwhm).toBeGreaterThan(0.95 * RESOLUTION_NM);
    expect(asNm.instrumentWidth!.fwhm).toBeLessThan(1.15 * RESOLUTION_NM);
    expect(Math.abs(asNm.instrumentWidth!.trend!.exponent)).toBeLessThan(0.3);
    expect(asNm.peaks[peakNear(asNm, 602)].broad).toBe(true);
    expect(asNm.peaks[peakNear(asNm, 510)].broad).toBe(false);
    // Too few clean lines to read a trend: nothing is estimated, and each peak's own width serves.
    const oneLine = x.map((nm) => (nm > 500 && nm < 520 ? 1 : 0));
    const few = analyzeSample(
      x,
      sample.y.map((v, i) => (oneLine[i] ? v : 100)),
      table,
      {},
    );
    expect(few.instrumentWidth).toBeNull();
    expect(few.peaks.every((p) => p.broad === undefined && p.resolutionNm === undefined)).toBe(
      true,
    );
    const given = analyzeSample(x, sample.y, table, { resolutionNm: RESOLUTION_NM });
    expect(given.instrumentWidth).toEqual({
      fwhm: RESOLUTION_NM,
      unit: "nm",
      basis: "resolutionNm",
    });
    expect(given.peaks[peakNear(given, 602)].broad).toBe(true);
    expect(() => analyzeSample(x, sample.y, table, { resolutionPx: 4 })).toThrow(RangeError);
    expect(() =>
      analyzeSample(sample.x, sample.y, table, { calibration, resolutionNm: -1 }),
    ).toThrow(/resolutionNm/);
    expect(() =>
      analyzeSample(sample.x, sample.y, table, { calibration, resolutionPx: 0 }),
    ).toThrow(/resolutionPx/);
  });

  it("turns a prism's resolutionNm into pixels at the middle of a calibrated axis, and reads the width from the peaks on an axis in nm", () => {
    const onPixels = analyzeSample(sample.x, sample.y, table, {
      calibration,
      resolutionNm: RESOLUTION_NM,
      dispersion: "prism",
    });
    expect(onPixels.instrumentWidth?.basis).toBe("resolutionNm");
    expect(onPixels.instrumentWidth?.unit).toBe("px");
    expect(onPixels.instrumentWidth!.fwhm / (RESOLUTION_NM / NM_PER_PX) - 1).toBeCloseTo(0, 9);
    const x = Float64Array.from(sample.x, wavelengthOfPixel);
    const onNm = analyzeSample(x, sample.y, table, {
      resolutionNm: RESOLUTION_NM,
      dispersion: "prism",
    });
    expect(onNm.instrumentWidth).toEqual(analyzeSample(x, sample.y, table, {}).instrumentWidth);
    expect(onNm.instrumentWidth?.basis).toBe("estimated");
  });
});
