// A straight line by Theil–Sen: the median of the slopes of every pair of points with different x,
// then the median of the intercepts. Both medians are xMedian's (the mean of the two middle values of
// an even count), with which the noise profile's sweeps were measured; ml-regression-theil-sen takes
// the lower one (see the design-packages bench).
import { xMedian } from "./x-median";

/** The line through (x, y) by Theil–Sen, or null when no two points differ in x. */
export function theilSenLine(
  x: Float64Array,
  y: Float64Array,
): { slope: number; intercept: number } | null {
  const slopes: number[] = [];
  for (let i = 0; i < x.length; i++) {
    for (let j = i + 1; j < x.length; j++) {
      const run = x[j] - x[i];
      if (run !== 0) slopes.push((y[j] - y[i]) / run);
    }
  }
  if (slopes.length === 0) return null;
  const slope = xMedian(Float64Array.from(slopes));
  const intercepts = Float64Array.from(y, (value, i) => value - slope * x[i]);
  return { slope, intercept: xMedian(intercepts) };
}
