// How a recalibration's drift compares with a day's: larger is a realignment.
import type { LinearDrift } from "./drifted-model";
import { RECALIBRATION_LIMITS } from "./recalibration-limits";

/**
 * How large `drift` is against a day's (RECALIBRATION_LIMITS.maxDailyStretch and maxDailyShiftShare):
 * the larger of its stretch and its shift at the array's middle, each over its daily bound (≤ 1 is a
 * day's drift).
 */
export function dailyDriftShare(
  drift: Pick<LinearDrift, "stretch" | "offset">,
  [xMin, xMax]: [number, number],
): number {
  const limits = RECALIBRATION_LIMITS;
  const middle = 0.5 * (xMin + xMax);
  const shift = drift.stretch * middle + drift.offset - middle;
  return Math.max(
    Math.abs(drift.stretch - 1) / limits.maxDailyStretch,
    Math.abs(shift) / (limits.maxDailyShiftShare * (xMax - xMin)),
  );
}
