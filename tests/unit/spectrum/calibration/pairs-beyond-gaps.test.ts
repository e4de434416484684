// Pairs beyond a wide gap decide the calibration at their end alone and are set aside; against the
// shorter span that is left, the next pair can stand beyond a gap of its own, and is set aside in turn. An instrument
// of the realistic-lamp generator (tests/support/realistic-lamp.ts), judged against its true axis.
import { describe, expect, it } from "vitest";
import { calibrateLamp } from "@/lib/spectrum/analysis/calibrate-lamp";
import { evaluateCalibration } from "@/lib/spectrum/calibration";
import { probeErrorRatio } from "../../../support/calibration-sweep";
import { realisticLamp } from "../../../support/realistic-lamp";

describe("pairs beyond gaps, one after another", () => {
  it("are set aside in turn, and what is left is trusted over the range it covers", () => {
    // Seed found on the blind sweep: a He lamp on a straight grating whose red lines stand apart from
    // the rest, He I 706.5 and 728.1 nm beyond one gap and 587.6 nm beyond another (one round of
    // setting aside left it "check").
    const lamp = realisticLamp(9600101);
    const result = calibrateLamp(lamp.x, lamp.y, lamp.lines, {
      nominalRangeNm: lamp.statedRangeNm,
      dispersion: "grating",
      resolutionNm: lamp.resolutionNm,
    });
    expect(result.pairing.status).toBe("paired");
    const model = result.fit!.model;
    expect(probeErrorRatio(lamp, model).ratio).toBeLessThanOrEqual(1);
    // The message names the three lines set aside, all beyond the covered range.
    const covered = Array.from(evaluateCalibration(model, Float64Array.from(model.coveredX)));
    const [low, high] = [Math.min(...covered), Math.max(...covered)];
    const aside = [...result.pairing.message.matchAll(/He I (\d+\.\d+) nm/g)].map((m) =>
      Number(m[1]),
    );
    expect(result.pairing.message).toMatch(/beyond a wide gap set aside/);
    expect(aside).toHaveLength(3);
    for (const nm of aside) expect(nm < low || nm > high, `${nm} nm`).toBe(true);
  });
});
