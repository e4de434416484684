// A sample on the wavelength axis its analysis used: through its calibration (ascending, samples the
// calibration cannot place left out), else as it came.
import { describe, expect, it } from "vitest";
import {
  evaluateCalibration,
  fitCalibration,
  type CalibrationModel,
} from "@/lib/spectrum/calibration";
import { sampleOnWavelengthAxis } from "@/lib/spectrum/analysis/sample-on-wavelength-axis";

/** A grating whose wavelength falls as the pixel grows: 700 nm at pixel 0, 0.2 nm per pixel. */
const falling = fitCalibration(
  Array.from({ length: 9 }, (_, i) => ({ x: 100 * i, wavelengthNm: 700 - 0.2 * 100 * i })),
  { model: "polynomial", degree: 1, domain: [0, 800], rejectOutliers: false },
).model;

describe("sampleOnWavelengthAxis", () => {
  it("puts pixels on ascending wavelengths through the calibration, with the companion alongside", () => {
    const x = Float64Array.from({ length: 5 }, (_, i) => 200 * i);
    const y = Float64Array.of(1, 2, 3, 4, 5);
    const companion = Float64Array.of(10, 20, 30, 40, 50);
    const onAxis = sampleOnWavelengthAxis({ x, y, companion }, falling);
    expect(Array.from(onAxis.wavelengthNm)).toEqual(
      Array.from(evaluateCalibration(falling, x)).reverse(),
    );
    expect(onAxis.wavelengthNm[0]).toBeCloseTo(540, 9);
    expect(onAxis.wavelengthNm[4]).toBeCloseTo(700, 9);
    expect(Array.from(onAxis.counts)).toEqual([5, 4, 3, 2, 1]);
    expect(Array.from(onAxis.companion!)).toEqual([50, 40, 30, 20, 10]);
    expect(Array.from(y)).toEqual([1, 2, 3, 4, 5]);
  });

  it("leaves out samples the calibration maps to no wavelength", () => {
    // A Hartmann model whose pole sits at pixel 1000: beyond it the formula has no real value.
    const hartmann: CalibrationModel = {
      ...falling,
      kind: "hartmann",
      poleSide: 1,
      parameters: [300, 200, 1.5, 1.2],
      parameterNames: ["lambda0Nm", "cNm", "t0", "alpha"],
      covariance: [0, 1, 2, 3].map(() => [0, 0, 0, 0]),
    };
    const x = Float64Array.of(0, 400, 800, 1200);
    expect(Number.isFinite(evaluateCalibration(hartmann, x)[3])).toBe(false);
    const onAxis = sampleOnWavelengthAxis({ x, y: Float64Array.of(1, 2, 3, 4) }, hartmann);
    expect(Array.from(onAxis.counts)).toEqual([1, 2, 3]);
    expect(onAxis.companion).toBeNull();
  });

  it("keeps an axis already in nm, turned ascending", () => {
    const onAxis = sampleOnWavelengthAxis(
      { x: Float64Array.of(589.6, 589.0, 588.4), y: Float64Array.of(7, 8, 9) },
      null,
    );
    expect(Array.from(onAxis.wavelengthNm)).toEqual([588.4, 589.0, 589.6]);
    expect(Array.from(onAxis.counts)).toEqual([9, 8, 7]);
  });

  it("refuses series of different lengths", () => {
    expect(() =>
      sampleOnWavelengthAxis({ x: Float64Array.of(1, 2), y: Float64Array.of(1) }, null),
    ).toThrow(RangeError);
  });
});
