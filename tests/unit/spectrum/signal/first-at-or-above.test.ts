// The lower-bound search that pairing uses to find peaks near a predicted position.
import { describe, expect, it } from "vitest";
import { firstAtOrAbove } from "@/lib/spectrum/signal/first-at-or-above";

describe("firstAtOrAbove", () => {
  const sorted = Float64Array.from([1, 2, 2, 5, 9]);
  it.each([
    [0, 0],
    [1, 0],
    [2, 1],
    [3, 3],
    [9, 4],
    [10, 5],
  ])("finds the first value ≥ %d at index %d", (value, index) => {
    expect(firstAtOrAbove(sorted, value)).toBe(index);
  });
  it("answers 0 for an empty array", () => {
    expect(firstAtOrAbove([], 3)).toBe(0);
  });
});
