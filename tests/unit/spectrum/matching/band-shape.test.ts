// Bands as bands: a resolved molecular band is a sharp head, blurred by the instrument, and a tail
// fading over its extent (common practice), so the peak it makes leans away from its head. A feature
// in the head zone that is symmetric or leans the other way is not that band; and an atomic line on a
// narrow peak inside the extent of a band called present needs its own confirming lines.
// The species and wavelengths are invented (a test table, not the trade's data).
import { describe, expect, it } from "vitest";
import { calibratePeaks } from "@/lib/spectrum/analysis";
import { identifyElements, matchPeaksToLines } from "@/lib/spectrum/matching";
import { findPeaks } from "@/lib/spectrum/peaks";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import type { CalibratedPeak, ReferenceLine } from "@/lib/spectrum/types";
import { calibratedPeak } from "../../../support/calibrated-peak";
import { inventedLine } from "../../../support/invented-line";

const INSTRUMENT_NM = 0.4;
const STEP_NM = 0.1;
const SIGMA_PER_FWHM = 1 / (2 * Math.sqrt(2 * Math.LN2));

/** A band of head 646 nm and extent 10 nm fading to the red (invented). */
const BAND = inventedLine(
  "XyO",
  646,
  { flame: 1000 },
  { band: { extentNm: 10, degradesTo: "red" }, flags: { bandHead: true } },
);

/** `profile` (in nm from 646) blurred by the instrument, on 600–700 nm with Poisson noise over 100 counts. */
function spectrum(profile: (offsetNm: number) => number, seed: number) {
  const random = makeRandom(seed);
  const x = Float64Array.from({ length: 1001 }, (_, i) => 600 + i * STEP_NM);
  const sigma = INSTRUMENT_NM * SIGMA_PER_FWHM;
  const blurred = (nm: number) => {
    let sum = 0;
    let weights = 0;
    for (let d = -4 * sigma; d <= 4 * sigma; d += 0.01) {
      const w = Math.exp(-0.5 * (d / sigma) ** 2);
      sum += w * profile(nm - 646 - d);
      weights += w;
    }
    return sum / weights;
  };
  const y = Float64Array.from(x, (nm) => random.poisson(100 + blurred(nm)));
  return { x, y };
}

/** The band's own shape: nothing to the blue of the head, a fade over a third of the extent. */
const bandShape = (offsetNm: number) => (offsetNm < 0 ? 0 : 3000 * Math.exp(-offsetNm / 3.3));

function bandMatched(profile: (offsetNm: number) => number, seed: number): boolean {
  const { x, y } = spectrum(profile, seed);
  const peaks = calibratePeaks(findPeaks(x, y), { instrumentFwhm: INSTRUMENT_NM });
  const top = peaks.reduce((a, b) => (b.height > a.height ? b : a));
  return matchPeaksToLines([top], [BAND])[0].candidates.some((c) => c.kind === "band");
}

describe("a band's peak leans away from its head", () => {
  it("matches a sharp head with a tail to the red, on every seed", () => {
    let matched = 0;
    for (let seed = 1; seed <= 10; seed++) if (bandMatched(bandShape, seed)) matched++;
    expect(matched).toBe(10);
  });

  it("does not match the same feature turned round (a sharp red edge and a tail to the blue)", () => {
    let matched = 0;
    for (let seed = 1; seed <= 10; seed++) {
      // Its top stays at 646 nm, inside the head zone.
      if (bandMatched((offsetNm) => bandShape(-offsetNm), seed)) matched++;
    }
    expect(matched).toBe(0);
  });

  it("does not match a symmetric hump as wide as the band's peak, centred in the head zone", () => {
    let matched = 0;
    for (let seed = 1; seed <= 10; seed++) {
      const hump = (offsetNm: number) =>
        3000 * Math.exp(-0.5 * ((offsetNm - 0.8) / (2.5 * SIGMA_PER_FWHM)) ** 2);
      if (bandMatched(hump, seed)) matched++;
    }
    expect(matched).toBe(0);
  });
});

describe("an atomic line inside the extent of a band called present", () => {
  const line = (species: string, airNm: number, flame: number): ReferenceLine =>
    inventedLine(species, airNm, { flame }, { ionStage: 1, uncertaintyNm: 0.002 });
  const peak = (wavelengthNm: number, snr: number, extra: Partial<CalibratedPeak> = {}) =>
    calibratedPeak(
      wavelengthNm,
      snr,
      { fwhmNm: INSTRUMENT_NM, uncertaintyNm: 0.003, resolutionNm: INSTRUMENT_NM },
      extra,
    );
  // The band's own peaks: its head at 646 and a second head at 672, both leaning to the red.
  const table = [
    BAND,
    inventedLine(
      "XyO",
      672,
      { flame: 800 },
      { band: { extentNm: 6, degradesTo: "red" }, flags: { bandHead: true } },
    ),
    line("Wv I", 650.2, 1000),
  ];
  const bandPeaks = [
    peak(646.3, 80, { fwhmNm: 2.4, redAsymmetry: 0.6 }),
    peak(672.3, 60, { fwhmNm: 1.8, redAsymmetry: 0.5 }),
  ];
  const options = {
    source: "flame" as const,
    rangeNm: [600, 700] as [number, number],
    resolutionNm: INSTRUMENT_NM,
  };

  it("makes a single-line call on a narrow peak 4 nm down the band's tail possible, naming the band", () => {
    const result = identifyElements([...bandPeaks, peak(650.2, 120)], table, options);
    expect(result.calls.find((c) => c.species === "XyO")?.verdict).toBe("present");
    const wv = result.calls.find((c) => c.species === "Wv I")!;
    expect(wv.verdict).toBe("possible");
    expect(wv.notes.join(" ")).toMatch(/^Interference: XyO also explains the only peak seen/);
  });

  it("keeps the call present when the line stands far above the band's brightest head", () => {
    // A band's tail is never brighter than its head: heads at SNR 80 and 60 cannot make 30 % of a
    // peak at SNR 1600.
    const result = identifyElements([...bandPeaks, peak(650.2, 1600)], table, options);
    expect(result.calls.find((c) => c.species === "XyO")?.verdict).toBe("present");
    expect(result.calls.find((c) => c.species === "Wv I")?.verdict).toBe("present");
  });

  it("keeps the call present when the band is not seen", () => {
    const result = identifyElements([peak(650.2, 120)], table, options);
    expect(result.calls.find((c) => c.species === "Wv I")?.verdict).toBe("present");
  });
});
