// How near its predicted place a strong lamp line's peak must stand for the line to count as seen,
// in matching tolerances (half a resolution element). The expected-lines checks of a blind pairing
// and of a recalibration, and the blind search's count of the strong lines it misses, ask the same
// question: whether the lamp shows the lines the calibration puts on the array, not how precisely
// their centres fall (the other checks judge that).
import { positionsWithin } from "../matching/lower-bound";

export const EXPECTED_PEAK_REACH = 1.5;

/** Whether any of the ascending peak positions `sortedX` lies within `reach` of `x`, ends included. */
export function peakWithinReach(sortedX: readonly number[], x: number, reach: number): boolean {
  const [start, end] = positionsWithin(sortedX, x - reach, x + reach);
  return end > start;
}
