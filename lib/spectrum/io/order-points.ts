// Checks that x runs strictly one way and returns the points increasing, reversing a file that runs downward.
import { SpectrumParseError } from "./spectrum-parse-error";

export interface OrderPointsOptions {
  /** 1-based file line of point i, for error messages; null where unknown. @default () => null */
  lineOf?: (index: number) => number | null;
  /** 1-based column of x, for error messages. @default null */
  column?: number | null;
}

export interface OrderedPoints {
  x: Float64Array;
  y: Float64Array;
  /** True when the input ran downward and was reversed. */
  reversed: boolean;
}

/** Throws "duplicate-x" or "non-monotonic-x" at the offending point; new arrays, inputs untouched. */
export function orderPoints(
  x: Float64Array,
  y: Float64Array,
  options: OrderPointsOptions = {},
): OrderedPoints {
  const { lineOf = () => null, column = null } = options;
  const direction = x.length > 1 ? Math.sign(x[1] - x[0]) : 1;
  for (let i = 1; i < x.length; i++) {
    const step = x[i] - x[i - 1];
    if (step === 0) {
      const previous = lineOf(i - 1);
      const where = previous === null ? `point ${i}` : `line ${previous}`;
      throw new SpectrumParseError(
        "duplicate-x",
        `x = ${x[i]} repeats the x of ${where}`,
        lineOf(i),
        column,
      );
    }
    if (Math.sign(step) !== direction) {
      const way = direction > 0 ? "up" : "down";
      throw new SpectrumParseError(
        "non-monotonic-x",
        `x = ${x[i]} turns back after ${x[i - 1]}; x must run strictly ${way} through the whole file`,
        lineOf(i),
        column,
      );
    }
  }
  if (direction > 0) return { x: Float64Array.from(x), y: Float64Array.from(y), reversed: false };
  return { x: Float64Array.from(x).reverse(), y: Float64Array.from(y).reverse(), reversed: true };
}
