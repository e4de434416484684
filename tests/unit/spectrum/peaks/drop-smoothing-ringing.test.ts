// Tops of the smoothing's ringing beside a strong line go; the valleys around them merge.
import { describe, it, expect } from "vitest";
import { dropSmoothingRinging } from "@/lib/spectrum/peaks/drop-smoothing-ringing";

describe("dropSmoothingRinging", () => {
  // Samples:           0  1   2  3    4     5  6   7  8   9  10  11  12  13  14  15  16  17  18
  const signal = Float64Array.of(0, 5, -2, 3, 1000, 0, 4, -1, 0, 0, 0, 0, 0, 0, 0, 30, 0, 2, 0);

  it("drops a top under 2 % of a neighbour within reach, keeps one beyond reach or strong enough", () => {
    const candidates = { tops: [1, 4, 6, 15, 17], valleys: [2, 5, 7, 16] };
    const result = dropSmoothingRinging(candidates, signal, { reach: 9, fraction: 0.02 });
    // 1 and 6 ring beside 4; 15 is 11 samples from 4; 17 is 2/30 of its neighbour, above 2 %.
    expect(result.tops).toEqual([4, 15, 17]);
    // Between 4 and 15 the lower of the valleys at 5 and 7 (7: −1); between 15 and 17, 16.
    expect(result.valleys).toEqual([7, 16]);
  });

  it("keeps every top when none is that small, and handles none", () => {
    const candidates = { tops: [4, 15], valleys: [9] };
    expect(dropSmoothingRinging(candidates, signal, { reach: 20, fraction: 0.02 })).toEqual(
      candidates,
    );
    expect(
      dropSmoothingRinging({ tops: [], valleys: [] }, signal, { reach: 9, fraction: 0.02 }),
    ).toEqual({ tops: [], valleys: [] });
  });
});
