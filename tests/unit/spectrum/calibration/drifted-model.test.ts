// A calibration moved by a linear drift must give, at today's pixel stretch·u + offset, exactly what it
// gave yesterday at u, for every model kind; the drift's uncertainty must widen the calibration's.
import { describe, expect, it } from "vitest";
import {
  calibrationUncertainty,
  evaluateCalibration,
  fitCalibration,
  type CalibrationModel,
  type FitCalibrationOptions,
} from "@/lib/spectrum/calibration";
import { driftedModel, type LinearDrift } from "@/lib/spectrum/calibration/drifted-model";
import { realisticLamp } from "../../../support/realistic-lamp";

/** A prism of a catalogue glass (F2) from the realistic-lamp generator, and its true axis. */
const lamp = realisticLamp(7, { dispersion: "prism", glass: "F2", pixels: 2048 });
const last = lamp.x.length - 1;
const truthPairs = Array.from({ length: 31 }, (_, i) => ({
  x: (last * i) / 30,
  wavelengthNm: lamp.wavelengthAt((last * i) / 30),
  xUncertainty: 0.05,
}));
const domain: [number, number] = [0, last];

function fitted(options: FitCalibrationOptions): CalibrationModel {
  return fitCalibration(truthPairs, { ...options, domain, rejectOutliers: false }).model;
}

const drift: LinearDrift = {
  stretch: 1.0021,
  offset: -2.7,
  pivot: 1000,
  covariance: [
    [0.01, 0],
    [0, 1e-8],
  ],
};

describe("driftedModel", () => {
  for (const options of [
    { model: "polynomial", degree: 5 },
    { model: "hartmann" },
    { model: "prism" },
  ] as FitCalibrationOptions[]) {
    it(`moves a ${options.model} model exactly`, () => {
      const previous = fitted(options);
      const moved = driftedModel(previous, drift, domain);
      expect(moved.kind).toBe(previous.kind);
      const us = Float64Array.from({ length: 21 }, (_, i) => 20 + (i * (last - 40)) / 20);
      const xs = us.map((u) => drift.stretch * u + drift.offset);
      const before = evaluateCalibration(previous, us);
      const after = evaluateCalibration(moved, xs);
      after.forEach((lambda, i) => expect(lambda).toBeCloseTo(before[i], 9));
    });

    it(`widens a ${options.model} model's uncertainty by the drift's`, () => {
      const previous = fitted(options);
      const moved = driftedModel(previous, drift, domain);
      const still = driftedModel(
        previous,
        {
          ...drift,
          covariance: [
            [0, 0],
            [0, 0],
          ],
        },
        domain,
      );
      const xs = Float64Array.from([100, 1000, 1900]);
      const wider = calibrationUncertainty(moved, xs);
      const same = calibrationUncertainty(still, xs);
      wider.forEach((sigma, i) => expect(sigma).toBeGreaterThan(same[i]));
    });
  }

  it("refuses a drift that would reverse the axis", () => {
    const previous = fitted({ model: "polynomial", degree: 3 });
    expect(() => driftedModel(previous, { ...drift, stretch: -1 }, domain)).toThrow(RangeError);
  });
});
