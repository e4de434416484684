// The blind search's short-baseline hypotheses are ranked by how closely their lines land, not by how
// many land somewhere in the window: on an argon lamp with many unlisted peaks, chance hypotheses land
// as many lines as the right one, only farther off.
import { describe, expect, it } from "vitest";
import { calibrateRealisticLamp, probeErrorRatio } from "../../../support/calibration-sweep";
import { realisticLamp } from "../../../support/realistic-lamp";

describe("the blind search on realistic lamps", () => {
  it("calibrates instrument 1155 right, a mercury–argon grating once paired 0.7 nm wrong in the blue", () => {
    // Of the blind sweep's CLI mix (99 peaks, 24 pairs): three blue pairs each took an unlisted
    // neighbour 0.3–0.9 nm from its line, and the curved grating's cubic bent onto them.
    const lamp = realisticLamp(1155);
    const result = calibrateRealisticLamp(lamp);
    expect(result.pairing.status).toBe("paired");
    expect(probeErrorRatio(lamp, result.fit!.model).ratio).toBeLessThanOrEqual(1);
  }, 60_000);
});
