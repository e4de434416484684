// A species seen only through a line the table gives no intensity has nothing to scale predictions
// from: its missing strong lines are named without an "expected SNR", never as "SNR ≈ 0".
import { describe, expect, it } from "vitest";
import { identifyElements } from "@/lib/spectrum/matching";
import type { CalibratedPeak } from "@/lib/spectrum/types";
import { inventedLine } from "../../../support/invented-line";

const peak: CalibratedPeak = {
  index: 0,
  x: 520.03,
  xUncertainty: 0.003,
  height: 500,
  fwhm: 0.3,
  area: 150,
  snr: 50,
  saturated: false,
  blended: false,
  wavelengthNm: 520.03,
  wavelengthUncertaintyNm: 0.003,
  fwhmNm: 0.3,
  resolutionNm: 0.3,
};

describe("missing lines of a species with no rated line seen", () => {
  it("names them without a predicted SNR", () => {
    const table = [
      inventedLine("Qx I", 520.03, {}),
      inventedLine("Qx I", 600.0, { flame: 1000 }),
      inventedLine("Qx I", 610.0, { flame: 800 }),
    ];
    const result = identifyElements([peak], table, {
      source: "flame",
      rangeNm: [400, 700],
      resolutionNm: 0.3,
    });
    const call = result.calls.find((c) => c.species === "Qx I")!;
    expect(call.missingStrongCount).toBe(2);
    expect(call.rationale).toContain("strong lines missing (600.00, 610.00 nm)");
    expect(call.rationale).not.toMatch(/SNR ≈ 0/);
  });
});
