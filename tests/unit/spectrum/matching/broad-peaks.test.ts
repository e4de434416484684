// Checks that a peak flagged broad is offered molecular bands only, and that a peak's own
// instrument resolution (resolutionNm) sets its tolerance in place of the global one.
import { describe, it, expect } from "vitest";
import { identifyElements, matchPeaksToLines } from "../../../../lib/spectrum/matching";
import type { CalibratedPeak, ReferenceLine } from "../../../../lib/spectrum/types";

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

function peak(wavelengthNm: number, extra: Partial<CalibratedPeak> = {}): CalibratedPeak {
  return {
    index: 0,
    x: wavelengthNm,
    xUncertainty: 0.03,
    height: 100,
    fwhm: 1,
    area: 100,
    snr: 50,
    saturated: false,
    blended: false,
    wavelengthNm,
    wavelengthUncertaintyNm: 0.03,
    fwhmNm: 1,
    ...extra,
  };
}

// A band head 5 nm short of the peak, degraded to the red over 20 nm: the peak lies in its head zone.
const band = line("xo", "XO", 600, {
  uncertaintyNm: 0.5,
  flags: { bandHead: true },
  band: { extentNm: 20, degradesTo: "red" },
});
// An atomic line right at the peak, and another one 4 nm away.
const atomic = line("x1", "X I", 605.0);
const nearby = line("y1", "Y I", 609.0);
const lines = [band, atomic, nearby];

describe("matchPeaksToLines on broad peaks", () => {
  it("offers a broad peak its bands only, however close an atomic line lies", () => {
    const wide = { fwhm: 40, fwhmNm: 10, resolutionNm: 1 };
    const [asLine, asBroad] = matchPeaksToLines(
      [peak(605.0, wide), peak(605.0, { ...wide, broad: true })],
      lines,
    );
    // Unflagged, a peak ten lines wide may hold lines anywhere across it: the atomic lines at its
    // centre and 4 nm away as well as the band …
    expect(asLine.candidates.map((c) => c.line.id).sort()).toEqual(["x1", "xo", "y1"]);
    // … flagged broad it keeps the band alone.
    expect(asBroad.candidates.map((c) => c.line.id)).toEqual(["xo"]);
    expect(asBroad.candidates[0].kind).toBe("band");
  });

  it("leaves a broad peak no candidate when no band reaches it, so it is listed unexplained", () => {
    const result = identifyElements(
      [peak(605.0, { fwhmNm: 10, resolutionNm: 1, broad: true, snr: 40 })],
      [atomic, nearby],
      {
        rangeNm: [590, 620],
      },
    );
    expect(result.matches[0].candidates).toEqual([]);
    expect(result.unexplainedPeaks.map((u) => [u.peakIndex, u.reason])).toEqual([
      [0, "no-candidate"],
    ]);
    expect(result.calls.find((c) => c.species === "X I")?.verdict ?? "absent").toBe("absent");
  });

  it("keeps atomic candidates on a blended peak that is not broad", () => {
    const [match] = matchPeaksToLines(
      [peak(605.0, { fwhmNm: 2.5, resolutionNm: 1, blended: true })],
      [atomic],
    );
    expect(match.candidates.map((c) => c.line.id)).toEqual(["x1"]);
  });
});

describe("matchPeaksToLines with a per-peak resolution", () => {
  it("uses the peak's resolutionNm in σ_res instead of the global resolutionNm", () => {
    const [match] = matchPeaksToLines([peak(605.3, { resolutionNm: 2 })], [atomic], {
      resolutionNm: 1,
    });
    // σ² = σ_peak² + σ_line² + σ_res²; a clean 1-nm peak is no wider than the instrument's line, so
    // σ_res is a tenth of the instrument's FWHM: the peak's own 2 nm (doc §2) …
    expect(match.candidates[0].sigmaNm).toBeCloseTo(
      Math.sqrt(0.03 ** 2 + 0.001 ** 2 + 0.2 ** 2),
      12,
    );
    // … or the global 1 nm.
    const [global] = matchPeaksToLines([peak(605.15)], [atomic], { resolutionNm: 1 });
    expect(global.candidates[0].sigmaNm).toBeCloseTo(
      Math.sqrt(0.03 ** 2 + 0.001 ** 2 + 0.1 ** 2),
      12,
    );
  });

  it("takes a peak's own FWHM when it is much wider than the instrument's, and a blend's at least the instrument's", () => {
    const [single, blend, narrowBlend] = matchPeaksToLines(
      [
        peak(605.3, { fwhmNm: 2.5, resolutionNm: 1 }),
        peak(605.3, { fwhmNm: 2.5, resolutionNm: 1, blended: true }),
        peak(605.3, { fwhmNm: 0.8, resolutionNm: 1, blended: true }),
      ],
      [atomic],
    );
    const sigma = (fwhmNm: number) => Math.sqrt(0.03 ** 2 + 0.001 ** 2 + fwhmNm ** 2 / 12);
    // 2.5 nm against a 1-nm line: its width beyond the instrument's (2.3 nm each side) spans the peak.
    expect(single.candidates[0].sigmaNm).toBeCloseTo(sigma(2.5), 12);
    expect(blend.candidates[0].sigmaNm).toBeCloseTo(sigma(2.5), 12);
    expect(narrowBlend.candidates[0].sigmaNm).toBeCloseTo(sigma(1), 12);
  });

  it("rejects a peak whose resolutionNm is not a positive number", () => {
    for (const resolutionNm of [0, -1, Number.NaN, Infinity]) {
      expect(() => matchPeaksToLines([peak(605, { resolutionNm })], [atomic])).toThrow(RangeError);
    }
  });
});
