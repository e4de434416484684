// Golden-section search for the minimum of a function that is unimodal on a bracket.

const RATIO = (Math.sqrt(5) - 1) / 2;

/**
 * Where `f` is least on [low, high], found by golden-section search until the bracket is no wider than
 * `tolerance`; each step keeps one of the two inner points and evaluates `f` once. `f` must have one
 * minimum on the bracket (a scan that brackets it comes first where it may have more).
 */
export function goldenSectionMinimum(
  f: (x: number) => number,
  low: number,
  high: number,
  tolerance: number,
): number {
  if (!(tolerance > 0)) throw new RangeError(`tolerance must be positive, got ${tolerance}`);
  let left = high - RATIO * (high - low);
  let right = low + RATIO * (high - low);
  let valueLeft = f(left);
  let valueRight = f(right);
  while (high - low > tolerance) {
    if (valueLeft < valueRight) {
      high = right;
      right = left;
      valueRight = valueLeft;
      left = high - RATIO * (high - low);
      valueLeft = f(left);
    } else {
      low = left;
      left = right;
      valueLeft = valueRight;
      right = low + RATIO * (high - low);
      valueRight = f(right);
    }
  }
  return (low + high) / 2;
}
