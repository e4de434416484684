// A lamp line whose centre lies within one FWHM of the array's end has part of its profile off the
// detector: its centre is pulled inwards and must not carry the calibration there. Checked on one
// instrument of the realistic-lamp generator (its own truth): a Kr lamp on an N-LASF9 prism whose
// Kr I 645.63 nm line sits 3 pixels from the end of a 2048-pixel array.
import { describe, expect, it } from "vitest";
import { calibrateLamp } from "@/lib/spectrum/analysis/calibrate-lamp";
import { probeErrorRatio } from "../../../support/calibration-sweep";
import { realisticLamp } from "../../../support/realistic-lamp";

const lamp = realisticLamp(8000019, { pixels: 2048 });
const result = calibrateLamp(lamp.x, lamp.y, lamp.lines, {
  nominalRangeNm: lamp.statedRangeNm,
  dispersion: "prism",
  resolutionNm: lamp.resolutionNm,
});

describe("a lamp line cut by the array's end", () => {
  it("is the instrument described above", () => {
    expect(lamp.dispersion).toBe("prism");
    expect(lamp.gases).toEqual(["Kr"]);
    const endPeak = result.peaks.reduce((a, b) => (b.x > a.x ? b : a));
    expect(lamp.x.length - 1 - endPeak.x).toBeLessThan(endPeak.fwhm);
  });

  it("gives the cut peak a centre uncertainty of at least its FWHM", () => {
    const endPeak = result.peaks.reduce((a, b) => (b.x > a.x ? b : a));
    expect(endPeak.xUncertainty).toBeGreaterThanOrEqual(endPeak.fwhm);
  });

  it("does not let it bend the calibration: a trusted result is right wherever it claims to cover", () => {
    // Before, the pairing was reported "paired" with the end 0.29 nm off (1.7 times the tolerance).
    expect(result.pairing.status).toBe("paired");
    expect(probeErrorRatio(lamp, result.fit!.model).ratio).toBeLessThanOrEqual(1);
  });
});
