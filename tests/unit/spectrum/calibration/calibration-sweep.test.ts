// A fixed-seed sweep of 300 realistic instruments (tests/support/realistic-lamp.ts) through automatic
// lamp calibration, against the generator's truth. The same figures, for any seed and size, come
// from `npm run sweep -- --seed N --n M` (add --previous for recalibration from the last calibration).
//
// The targets: success ≥ 95 % where ≥ 6 table lamp lines are in range; silent wrong (reported
// "paired" but outside tolerance) ≤ 0.5 % of all; 0 exceptions; ≥ 99 % with the previous calibration.
// Not all are reached yet: the floors below are what this code measured on these seeds (a regression
// floor, not the goal); raise them as the pairing improves.
import { beforeAll, describe, expect, it } from "vitest";
import {
  runSweep,
  summarise,
  type SweepRecord,
  type SweepSummary,
} from "../../../support/calibration-sweep";

// Cheaper than the CLI's mix (2048-pixel arrays only) so the unit suite stays quick.
const SEED = 1000;
const COUNT = 300;
/** Measured on these seeds when the floor was set (see the commit): silent wrong and eligible success. */
const SILENT_WRONG_FLOOR = 0.03;
const SUCCESS_FLOOR = 0.15;

describe("automatic calibration over 300 realistic instruments", () => {
  let records: SweepRecord[] = [];
  let summary: SweepSummary;
  beforeAll(() => {
    records = runSweep({ seed: SEED, n: COUNT, lamp: { pixels: 2048 } });
    summary = summarise(records);
  }, 900_000);

  it("never throws", () => {
    expect(records).toHaveLength(COUNT);
    expect(summary.exceptions).toBe(0);
  });

  it("is rarely silently wrong", () => {
    // Target ≤ 0.5 %; floor measured: SILENT_WRONG_FLOOR.
    expect(summary.silentWrongRate).toBeLessThanOrEqual(SILENT_WRONG_FLOOR);
  });

  it("succeeds at least as often as it did when this floor was set", () => {
    // Target ≥ 95 % of eligible instruments; floor measured: SUCCESS_FLOOR.
    expect(summary.successRateEligible).toBeGreaterThanOrEqual(SUCCESS_FLOOR);
  });
});
