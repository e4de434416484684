// A recalibration's drift in the words its checks and its message use.
import type { LinearDrift } from "./drifted-model";

function signed(value: number, digits: number): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(digits)}`;
}

/** How far `drift` moved the middle of the array `domain` and how much it stretched it, in words. */
export function driftWords(
  drift: LinearDrift,
  [xMin, xMax]: [number, number],
): { moved: string; stretched: string } {
  const middle = 0.5 * (xMin + xMax);
  const todayX = (u: number) => drift.stretch * u + drift.offset;
  return {
    moved: `moved by ${signed(todayX(middle) - middle, 2)} x units at the middle`,
    stretched: `stretched by ${signed(100 * (drift.stretch - 1), 3)} %`,
  };
}
