// Why lamp peaks are left unpaired (a blend, not in the table, the line taken by another peak, left out)
// and which expected lamp lines have no peak, judged within 1.5 local FWHM of the calibrated wavelength.
import { describe, expect, it } from "vitest";
import { unpairedLampPeaks } from "@/lib/spectrum/calibration";

const FWHM_NM = 1; // reach: 1.5 nm
const peak = (wavelengthNm: number, paired = false, fwhmNm = FWHM_NM) => ({
  wavelengthNm,
  fwhmNm,
  paired,
});
const line = (wavelengthNm: number, paired = false) => ({ wavelengthNm, paired });
const OPTIONS = { arrayRangeNm: [400, 900] as const };

describe("unpairedLampPeaks", () => {
  it("gives paired peaks no reason", () => {
    const { peakReasons } = unpairedLampPeaks([peak(500, true)], [line(500, true)], OPTIONS);
    expect(peakReasons).toEqual([null]);
  });

  it("says 'not in the table' when no lamp line lies within 1.5 FWHM", () => {
    const { peakReasons } = unpairedLampPeaks(
      [peak(600), peak(700)],
      [line(601.6), line(701.4)],
      OPTIONS,
    );
    expect(peakReasons[0]).toEqual({ code: "not-in-table", lineIndices: [] });
    expect(peakReasons[1]).toEqual({ code: "left-unpaired", lineIndices: [1] });
  });

  it("says 'blend' when another lamp line lies within 1.5 FWHM of the table line near the peak", () => {
    // 650.0 is near the peak; 651.2 lies 1.2 nm from it (within reach), though 1.7 nm from the peak.
    const { peakReasons } = unpairedLampPeaks(
      [peak(649.8)],
      [line(640), line(650.0), line(651.5)],
      OPTIONS,
    );
    expect(peakReasons[0]).toEqual({ code: "blend", lineIndices: [1, 2] });
    // Pushed 1.6 nm apart, the partner is out of reach: not a blend.
    const apart = unpairedLampPeaks([peak(649.8)], [line(640), line(650.0), line(651.7)], OPTIONS);
    expect(apart.peakReasons[0]).toEqual({ code: "left-unpaired", lineIndices: [1] });
  });

  it("uses each peak's own width", () => {
    const { peakReasons } = unpairedLampPeaks([peak(600, false, 2)], [line(602.9)], OPTIONS);
    expect(peakReasons[0]).toEqual({ code: "left-unpaired", lineIndices: [0] });
  });

  it("names a line already paired with another peak", () => {
    const { peakReasons } = unpairedLampPeaks(
      [peak(500, true), peak(500.9)],
      [line(500, true)],
      OPTIONS,
    );
    expect(peakReasons[1]).toEqual({ code: "line-paired-elsewhere", lineIndices: [0] });
  });

  it("says a peak the calibration gives no wavelength has none", () => {
    expect(unpairedLampPeaks([peak(Number.NaN)], [line(500)], OPTIONS).peakReasons[0]).toEqual({
      code: "no-wavelength",
      lineIndices: [],
    });
  });

  it("lists unpaired lines on the array with no peak within 1.5 FWHM as expected without a peak", () => {
    const peaks = [peak(500, true), peak(600), peak(700, false, 3)];
    const lines = [
      line(500, true), // paired
      line(550), // no peak near: expected without a peak
      line(601.2), // the 600 nm peak is near
      line(704), // within 1.5 × 3 nm of the broad 700 nm peak
      line(380), // off the array
      line(950), // off the array
    ];
    expect(unpairedLampPeaks(peaks, lines, OPTIONS).expectedWithoutPeak).toEqual([1]);
  });

  it("refuses widths and ranges that make no sense", () => {
    expect(() => unpairedLampPeaks([peak(500, false, 0)], [], OPTIONS)).toThrow(RangeError);
    expect(() => unpairedLampPeaks([], [], { arrayRangeNm: [900, 400] })).toThrow(RangeError);
    expect(() => unpairedLampPeaks([], [line(-1)], OPTIONS)).toThrow(RangeError);
  });
});
