// x(λ) of a calibration model over an x interval, by inverting it on a dense grid: pairing asks where
// each lamp line lands on the array, the model answers the other way round.
import type { CalibrationModel } from "./calibration-model";
import { modelEvaluation } from "./model-evaluation";

/** Grid points the inversion interpolates between (a 4096-pixel array: about one per pixel). */
const GRID_POINTS = 4097;

/** x(λ) of `model` on [xMin, xMax]; NaN for a wavelength the model does not reach there. */
export function inverseOfModel(
  model: CalibrationModel,
  [xMin, xMax]: [number, number],
): (lambda: number) => number {
  const grid = Float64Array.from(
    { length: GRID_POINTS },
    (_, i) => xMin + ((xMax - xMin) * i) / (GRID_POINTS - 1),
  );
  const wavelengths = modelEvaluation(model, grid).wavelengthNm;
  const rising = wavelengths[GRID_POINTS - 1] > wavelengths[0];
  const value = (i: number) => (rising ? wavelengths[i] : -wavelengths[i]);
  return (lambda) => {
    const goal = rising ? lambda : -lambda;
    if (!(goal >= value(0) && goal <= value(GRID_POINTS - 1))) return Number.NaN;
    let low = 0;
    let high = GRID_POINTS - 1;
    while (high - low > 1) {
      const mid = (low + high) >> 1;
      if (value(mid) <= goal) low = mid;
      else high = mid;
    }
    const span = value(high) - value(low) || 1;
    return grid[low] + ((grid[high] - grid[low]) * (goal - value(low))) / span;
  };
}
