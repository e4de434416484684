// The covered range of a recalibration: where the drift is known well enough to trust the moved model.
import type { CalibrationModel } from "./calibration-model";
import { dailyDriftShare } from "./daily-drift-share";
import type { LinearDrift } from "./drifted-model";
import type { LampPair } from "./lamp-pairing-types";
import { RECALIBRATION_LIMITS } from "./recalibration-limits";

/**
 * Where today's calibration is known: yesterday's covered range moved by the drift, narrowed to where the
 * drift's own 1σ stays within maxDriftSigma tolerances (it grows away from the lines' weighted middle)
 * and to maxExtrapolationShare of the array beyond the outermost lines. Empty ([c, c]) when the lines
 * fix the drift nowhere that well.
 */
export function coveredByDrift(
  drift: LinearDrift,
  previous: CalibrationModel,
  pairs: readonly LampPair[],
  [xMin, xMax]: [number, number],
  tolerance: number,
): [number, number] {
  const limits = RECALIBRATION_LIMITS;
  const xs = pairs.map((p) => p.x).sort((a, b) => a - b);
  const span = xMax - xMin;
  // A day's drift keeps yesterday's shape, so it holds a little beyond today's lines. A large one is a
  // realigned instrument whose shape may have bent: it is trusted only between the lines, the outermost
  // at each end left out (one chance coincidence far from the rest would otherwise stretch it).
  const small = dailyDriftShare(drift, [xMin, xMax]) <= 1;
  const inner = xs.length >= 4 && !small ? xs.slice(1, -1) : xs;
  const reach = small ? limits.maxExtrapolationShare * span : 0;
  let low = Math.max(xMin, drift.stretch * previous.coveredX[0] + drift.offset, inner[0] - reach);
  let high = Math.min(
    xMax,
    drift.stretch * previous.coveredX[1] + drift.offset,
    inner[inner.length - 1] + reach,
  );
  // σ²(x) = c₀₀ + 2c₀₁d + c₁₁d² with d = (x − pivot)/stretch, the pivot being the pairs' mean u moved.
  const [[c00, c01], [, c11]] = drift.covariance;
  const limit = (limits.maxDriftSigma * tolerance) ** 2;
  const none: [number, number] = [drift.pivot, drift.pivot];
  if (!(c11 > 0)) return c00 <= limit ? [low, high] : none;
  const centre = -c01 / c11;
  const square = centre * centre - (c00 - limit) / c11;
  if (!(square > 0)) return none;
  low = Math.max(low, drift.pivot + drift.stretch * (centre - Math.sqrt(square)));
  high = Math.min(high, drift.pivot + drift.stretch * (centre + Math.sqrt(square)));
  return high > low ? [low, high] : none;
}
