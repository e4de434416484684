// The DIFDUP encoder on the standard's own examples, its line limit and Y check lines, and the even
// resampling that feeds it.
import { describe, expect, it } from "vitest";
import { encodeJcampDifDup } from "@/lib/spectrum/io/encode-jcamp-dif-dup";
import { resampleEvenly } from "@/lib/spectrum/io";

describe("encodeJcampDifDup", () => {
  it("writes the standard's examples", () => {
    // JCAMP-DX 4.24 sec. 5.10 (as checked against the paper): 50 50 50 50 is 50%U in DIFDUP form; the first value
    // here is in SQZ form (E0 = +50, sec. 5.5), and the line ending in DIF form gets its Y check line.
    expect(encodeJcampDifDup([50, 50, 50, 50], (i) => String(500 + i))).toEqual([
      "500E0%U",
      "503E0",
    ]);
    // Table VII's ten ordinates (as checked against the paper), DIFDUP form "1JT%jX" after an SQZ first value.
    expect(encodeJcampDifDup([1, 2, 3, 3, 2, 1, 0, -1, -2, -3], (i) => String(401 + i))).toEqual([
      "401AJT%jX",
      "410c",
    ]);
  });

  it("writes DUP counts of ten and more with further digits, and multi-digit values", () => {
    const ordinates = [1000, ...Array.from({ length: 12 }, (_, i) => 1000 - 25 * (i + 1))];
    // 12 equal differences of −25: k5 then the count 12 as S2 (sec. 5.9: the count's first digit is the pseudo-digit).
    expect(encodeJcampDifDup(ordinates, () => "7")).toEqual(["7A000k5S2", "7G00"]);
  });

  it("keeps every line within the limit and repeats the last ordinate at the start of the next", () => {
    const ordinates = Array.from({ length: 500 }, (_, i) => Math.round(1e6 * Math.sin(i / 3)));
    const lines = encodeJcampDifDup(ordinates, (i) => (1000 + i).toString(), { maxLineLength: 40 });
    expect(lines.length).toBeGreaterThan(20);
    for (const line of lines) expect(line.length).toBeLessThanOrEqual(40);
    // Every line after the first opens at the point where the previous one ended (the Y check).
    const opening = lines.map((line) => Number(/^\d+/.exec(line)![0]) - 1000);
    expect(opening[0]).toBe(0);
    expect(opening.at(-1)).toBe(499);
    expect(() => encodeJcampDifDup([1.5, 2], () => "1")).toThrow(/not a safe integer/);
  });
});

describe("resampleEvenly", () => {
  it("reproduces a straight line exactly and keeps the first and last x", () => {
    const x = Float64Array.from({ length: 50 }, (_, i) => 400 + 0.3 * i + 0.002 * i * i);
    const y = Float64Array.from(x, (v) => 3 * v - 7);
    const even = resampleEvenly({ x, y, xUnit: "nm", medium: "air", meta: {} });
    expect(even.x.length).toBe(50);
    expect(even.x[0]).toBe(x[0]);
    expect(even.x[49]).toBe(x[49]);
    expect(even.medium).toBe("air");
    const step = (x[49] - x[0]) / 49;
    for (let i = 0; i < 50; i++) {
      expect(even.x[i]).toBeCloseTo(x[0] + i * step, 9);
      expect(even.y[i]).toBeCloseTo(3 * even.x[i] - 7, 9);
    }
  });

  it("never overshoots its neighbours and refuses what it cannot resample", () => {
    const x = Float64Array.of(1, 2, 2.5, 7, 8);
    const y = Float64Array.of(0, 10, 0, 5, 5);
    const even = resampleEvenly({ x, y, xUnit: "nm", meta: {} }, { points: 29 });
    for (const v of even.y) expect(v >= 0 && v <= 10).toBe(true);
    expect(() =>
      resampleEvenly({ x: Float64Array.of(1, 1), y: Float64Array.of(1, 2), xUnit: "nm", meta: {} }),
    ).toThrow(/strictly increasing/);
    expect(() => resampleEvenly({ x, y, xUnit: "nm", meta: {} }, { points: 1 })).toThrow(
      RangeError,
    );
  });
});
