// Saturation runs and the prepared signal that the peak finder and the charts share.
import { describe, it, expect } from "vitest";
import { findSaturatedRanges, prepareSignal } from "@/lib/spectrum/signal";

describe("findSaturatedRanges", () => {
  it("finds runs at a known detector maximum, single samples included", () => {
    const y = Float64Array.of(10, 20, 65535, 65535, 65535, 30, 65500, 12, 65535);
    expect(findSaturatedRanges(y, { detectorMax: 65535 })).toEqual([
      { start: 2, end: 4 },
      { start: 6, end: 6 },
      { start: 8, end: 8 },
    ]);
  });

  it("without detectorMax finds flat tops of ≥ 3 samples at the array maximum only", () => {
    expect(findSaturatedRanges(Float64Array.of(1, 5, 9, 9, 9, 2, 9, 9, 1))).toEqual([
      { start: 2, end: 4 },
    ]);
    expect(findSaturatedRanges(Float64Array.of(1, 5, 9, 3, 2))).toEqual([]);
    expect(findSaturatedRanges(Float64Array.of(4, 4, 4, 4))).toEqual([]);
  });

  it("rejects bad options", () => {
    expect(() => findSaturatedRanges(Float64Array.of(1, 2), { nearMaxFraction: 2 })).toThrow(
      RangeError,
    );
    expect(() => findSaturatedRanges(Float64Array.of(1, 2), { minRunLength: 0 })).toThrow(
      RangeError,
    );
  });
});

describe("prepareSignal", () => {
  const n = 256;
  const x = Float64Array.from({ length: n }, (_, i) => 500 + 0.25 * i);
  const y = Float64Array.from(
    { length: n },
    (_, i) => 100 + 0.3 * i + 500 * Math.exp(-0.5 * ((i - 128) / 3) ** 2) + 3 * Math.sin(i * i),
  );

  it("returns smoothed, continuum and corrected = smoothed − continuum, without touching the input", () => {
    const copy = Float64Array.from(y);
    const s = prepareSignal(x, y);
    expect(s.smoothed.length).toBe(n);
    s.corrected.forEach((v, i) => expect(v).toBeCloseTo(s.smoothed[i] - s.continuum[i], 9));
    expect(s.noise).toBeGreaterThan(0);
    expect(Array.from(y)).toEqual(Array.from(copy));
  });

  it("rejects reversed x, mismatched lengths, short input and a window longer than the data", () => {
    expect(() => prepareSignal(x.slice().reverse(), y)).toThrow(RangeError);
    expect(() => prepareSignal(x, y.subarray(1))).toThrow(RangeError);
    expect(() => prepareSignal(x.subarray(0, 10), y.subarray(0, 10))).toThrow(RangeError);
    expect(() =>
      prepareSignal(x.subarray(0, 20), y.subarray(0, 20), { smoothing: { windowSize: 21 } }),
    ).toThrow(RangeError);
  });
});
