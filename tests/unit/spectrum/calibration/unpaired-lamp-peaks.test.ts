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

  it("says 'broad' for a peak three times wider than the paired lines near it, naming no line", () => {
    // A continuum hump 20 nm wide over lamp lines 1 nm wide: no lamp line makes it, and its width
    // neither reaches nor hides the expected line at 712 nm.
    const peaks = [
      peak(690, true),
      peak(700, true),
      peak(720, true),
      peak(705, false, 20),
      peak(730, false, 2.5),
    ];
    const lines = [
      line(690, true),
      line(700, true),
      line(703),
      line(706),
      line(712),
      line(720, true),
      line(730.5),
    ];
    const { peakReasons, expectedWithoutPeak } = unpairedLampPeaks(peaks, lines, OPTIONS);
    expect(peakReasons[3]).toEqual({ code: "broad", lineIndices: [] });
    // 2.5 times the paired lines' width is still a line (a blend or a broadened one).
    expect(peakReasons[4]?.code).toBe("left-unpaired");
    expect(expectedWithoutPeak).toEqual([2, 3, 4]);
  });

  it("compares a peak's width with the paired peaks near it, as a prism's line widths grow to the red", () => {
    // Lines 0.5 nm wide in the blue and 5 nm wide in the red: a 4-nm peak is broad in the blue only.
    const peaks = [
      peak(400, true, 0.5),
      peak(410, true, 0.5),
      peak(420, true, 0.5),
      peak(850, true, 5),
      peak(870, true, 5),
      peak(415, false, 4),
      peak(860, false, 4),
    ];
    const { peakReasons } = unpairedLampPeaks(peaks, [line(400, true), line(880)], OPTIONS);
    expect(peakReasons[5]?.code).toBe("broad");
    expect(peakReasons[6]?.code).not.toBe("broad");
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
