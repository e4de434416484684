// An expected line beside a stronger one of the same species, too close for the dip between them to
// clear the peak finder's test, is not "missing": it hides in the stronger line's peak. Far enough, or
// bright enough for a clear dip, and unseen, it still counts against the call.
// The species and wavelengths are invented (a test table, not the trade's data).
import { describe, expect, it } from "vitest";
import { identifyElements } from "@/lib/spectrum/matching";
import { calibratedPeak } from "../../../support/calibrated-peak";
import { inventedLine } from "../../../support/invented-line";

// A doublet 0.6 nm apart, the second line half the first (as the sodium D pair), at 0.46 nm resolution.
const table = [
  inventedLine("Xa I", 520.0, { flame: 1000 }, { uncertaintyNm: 0.002 }),
  inventedLine("Xa I", 520.6, { flame: 500 }, { uncertaintyNm: 0.002 }),
];
const options = {
  source: "flame" as const,
  rangeNm: [400, 700] as [number, number],
  resolutionNm: 0.46,
};
const peakAt = (snr: number) =>
  calibratedPeak(520.0, snr, { fwhmNm: 0.56, uncertaintyNm: 0.004, resolutionNm: 0.46 });
const xa = (snr: number) =>
  identifyElements([peakAt(snr)], table, options).calls.find((c) => c.species === "Xa I")!;

describe("a fainter companion too close to resolve", () => {
  it("is not missing beside a peak of SNR 40, where its dip would be under 6 σ", () => {
    const call = xa(40);
    expect(call.missingStrongCount).toBe(0);
    expect(call.verdict).toBe("present");
  });

  it("is missing beside a peak of SNR 400, where the dip would stand out", () => {
    const call = xa(400);
    expect(call.missingStrongCount).toBe(1);
    expect(call.verdict).not.toBe("present");
  });
});
