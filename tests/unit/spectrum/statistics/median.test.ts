import { describe, expect, it } from "vitest";
import { median } from "@/lib/spectrum/statistics/median";

describe("median", () => {
  it("takes the middle value of an odd count and the mean of the middle two of an even one", () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([7])).toBe(7);
  });

  it("leaves its input in order and is NaN for no values", () => {
    const values = [3, 1, 2];
    median(values);
    expect(values).toEqual([3, 1, 2]);
    expect(median([])).toBeNaN();
  });
});
