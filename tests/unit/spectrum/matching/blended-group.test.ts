// Lines blended into one peak are one piece of evidence: the Na D doublet at 1 nm resolution is one
// group of two lines with one credit, and the evidence says so.
import { describe, it, expect } from "vitest";
import { identifyElements } from "@/lib/spectrum/matching";
import { calibratedPeak } from "../../../support/calibrated-peak";
import { inventedLine } from "../../../support/invented-line";

// NIST ASD air wavelengths of the Na D lines (from memory); D2 about twice D1 in a flame (common practice).
const D2 = inventedLine("Na I", 588.995, { flame: 1000 });
const D1 = inventedLine("Na I", 589.592, { flame: 500 });

// At 1 nm resolution the doublet (0.6 nm apart) is one peak at its intensity-weighted centre, 15 %
// wider than one line.
const peak = calibratedPeak(
  589.194,
  500,
  { fwhmNm: 1.15, uncertaintyNm: 0.005, resolutionNm: 1 },
  { index: 100, area: 6000 },
);
const options = {
  source: "flame" as const,
  rangeNm: [580, 600] as [number, number],
  resolutionNm: 1,
};

describe("a blend of one species' lines in one peak", () => {
  const both = identifyElements([peak], [D2, D1], options).calls.find((c) => c.species === "Na I")!;

  it("sees both lines, at the one peak, as one group", () => {
    expect(both.seen.map((s) => s.referenceNm).sort()).toEqual([588.995, 589.592]);
    expect(new Set(both.seen.map((s) => s.peakIndex))).toEqual(new Set([0]));
    expect(both.seenCount).toBe(2);
    expect(both.seenPeaks).toBe(1);
    expect(both.rationale).toMatch(/^Present: 2 lines seen at 1 peak \(/);
  });

  it("earns one credit for the peak, not two: the score is what the stronger line alone earns", () => {
    const alone = identifyElements([peak], [D2], options).calls.find((c) => c.species === "Na I")!;
    expect(both.score).toBe(alone.score);
  });
});
