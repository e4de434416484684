// Checks that calibrated peaks carry the instrument's width at their own wavelength and the broad flag.
import { describe, it, expect } from "vitest";
import { calibratePeaks } from "../../../../lib/spectrum/analysis";
import { fitCalibration } from "../../../../lib/spectrum/calibration";
import type { Peak } from "../../../../lib/spectrum/types";

function peak(x: number, fwhm: number, extra: Partial<Peak> = {}): Peak {
  return {
    index: Math.round(x),
    x,
    xUncertainty: 0.05,
    height: 1000,
    fwhm,
    area: 1000 * fwhm,
    snr: 100,
    saturated: false,
    blended: false,
    ...extra,
  };
}

// An exact quadratic dispersion λ = 400 + 0.2x + 5e-5 x², so dλ/dx = 0.2 + 1e-4 x is known everywhere.
const wavelengthOf = (x: number) => 400 + 0.2 * x + 5e-5 * x * x;
const pairs = [0, 300, 600, 900, 1200, 1500, 1800, 2047].map((x) => ({
  x,
  wavelengthNm: wavelengthOf(x),
}));
const calibration = fitCalibration(pairs, {
  model: "polynomial",
  degree: 2,
  domain: [0, 2047],
}).model;

describe("calibratePeaks with an instrument width", () => {
  it("gives each peak the instrument's FWHM in nm through its local dispersion", () => {
    const peaks = calibratePeaks([peak(100, 3), peak(1000, 3), peak(2000, 3)], {
      calibration,
      instrumentFwhm: 3,
    });
    for (const p of peaks) {
      expect(p.resolutionNm! / (3 * (0.2 + 1e-4 * p.x)) - 1).toBeCloseTo(0, 6);
      expect(p.resolutionNm! / p.fwhmNm - 1).toBeCloseTo(0, 12);
      expect(p.broad).toBe(false);
    }
  });

  it("flags peaks wider than broadFactor instrument widths, but never a saturated one", () => {
    const peaks = calibratePeaks(
      [
        peak(500, 8.9),
        peak(600, 9.1),
        peak(700, 9.1, { blended: true }),
        peak(800, 12, { saturated: true }),
      ],
      { calibration, instrumentFwhm: 3 },
    );
    expect(peaks.map((p) => p.broad)).toEqual([false, true, true, false]);
    const wider = calibratePeaks([peak(600, 9.1)], {
      calibration,
      instrumentFwhm: 3,
      broadFactor: 4,
    });
    expect(wider[0].broad).toBe(false);
  });

  it("on an axis already in nm takes the width in nm as it is", () => {
    const [p] = calibratePeaks([peak(589, 1.2)], { instrumentFwhm: 0.5 });
    expect(p.resolutionNm).toBe(0.5);
    expect(p.broad).toBe(false);
  });

  it("sets neither field without an instrument width, and rejects a nonsense one", () => {
    const [p] = calibratePeaks([peak(600, 30)], { calibration });
    expect(p.resolutionNm).toBeUndefined();
    expect(p.broad).toBeUndefined();
    expect(() => calibratePeaks([peak(600, 3)], { calibration, instrumentFwhm: 0 })).toThrow(
      RangeError,
    );
    expect(() =>
      calibratePeaks([peak(600, 3)], { calibration, instrumentFwhm: 3, broadFactor: Number.NaN }),
    ).toThrow(RangeError);
  });
});

describe("calibratePeaks and a peak's lean", () => {
  it("keeps the lean towards the red on an axis whose wavelength rises with x, and turns it round where it falls", () => {
    const falling = fitCalibration(
      pairs.map(({ x, wavelengthNm }) => ({ x: 2047 - x, wavelengthNm })),
      { model: "polynomial", degree: 2, domain: [0, 2047] },
    ).model;
    const leaning = peak(1000, 6, { asymmetry: 0.4 });
    expect(calibratePeaks([leaning], { calibration })[0].redAsymmetry).toBeCloseTo(0.4, 12);
    expect(calibratePeaks([leaning], { calibration: falling })[0].redAsymmetry).toBeCloseTo(
      -0.4,
      12,
    );
    expect(calibratePeaks([peak(1000, 6)], { calibration })[0].redAsymmetry).toBeUndefined();
  });
});
