// The two binary searches every range look-up of the line index rests on, against a linear scan.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { firstAbove, lowerBound, positionsWithin } from "@/lib/spectrum/matching/lower-bound";
import "../../../support/fast-check-seed";

describe("lowerBound, firstAbove and positionsWithin", () => {
  it("find the first position at or above, and above, the target, inside the given bounds", () => {
    fc.assert(
      fc.property(
        // Few distinct values, so that runs of equal values are common.
        fc.array(fc.integer({ min: 0, max: 8 }), { maxLength: 30 }),
        fc.integer({ min: -1, max: 9 }),
        fc.nat(),
        fc.nat(),
        (raw, target, a, b) => {
          const values = Float64Array.from(raw.sort((x, y) => x - y));
          const from = values.length === 0 ? 0 : a % (values.length + 1);
          const to = from + (values.length === 0 ? 0 : b % (values.length - from + 1));
          const scan = (past: (v: number) => boolean) => {
            let i = from;
            while (i < to && past(values[i])) i++;
            return i;
          };
          expect(lowerBound(values, target, from, to)).toBe(scan((v) => v < target));
          expect(firstAbove(values, target, from, to)).toBe(scan((v) => v <= target));
          // The values inside [target, target + 2], as a filter of the bounded slice finds them.
          const [start, end] = positionsWithin(values, target, target + 2, from, to);
          const inside = Array.from(values.subarray(from, to)).filter(
            (v) => v >= target && v <= target + 2,
          );
          expect(Array.from(values.subarray(start, end))).toEqual(inside);
        },
      ),
    );
  });

  it("search the whole array by default", () => {
    const values = Float64Array.of(1, 2, 2, 2, 3);
    expect(lowerBound(values, 2)).toBe(1);
    expect(firstAbove(values, 2)).toBe(4);
    expect(lowerBound(values, 9)).toBe(5);
    expect(firstAbove(values, 0)).toBe(0);
  });
});

describe("lowerBound where pairing finds peaks near a predicted position", () => {
  const sorted = Float64Array.from([1, 2, 2, 5, 9]);
  it.each([
    [0, 0],
    [1, 0],
    [2, 1],
    [3, 3],
    [9, 4],
    [10, 5],
  ])("finds the first value ≥ %d at index %d", (value, index) => {
    expect(lowerBound(sorted, value)).toBe(index);
  });
  it("answers 0 for an empty array", () => {
    expect(lowerBound([], 3)).toBe(0);
  });
});
