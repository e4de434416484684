// Savitzky–Golay wrapper: against the 1964 tables, SciPy's savgol_coeffs/savgol_filter, and its own contract.
import { describe, it, expect } from "vitest";
import reference from "../../../reference/signal-reference.json";
import { savitzkyGolay, savitzkyGolayCoefficients } from "@/lib/spectrum/signal";

const times = (values: Float64Array, factor: number) => Array.from(values, (v) => v * factor);

describe("savitzkyGolayCoefficients", () => {
  it("matches the Savitzky & Golay (1964) smoothing and derivative convolutes", () => {
    // Savitzky & Golay 1964, 5-point quadratic smoothing (−3, 12, 17, 12, −3)/35 (from memory)
    times(savitzkyGolayCoefficients({ windowSize: 5, polynomial: 2 }), 35).forEach((v, j) =>
      expect(v).toBeCloseTo([-3, 12, 17, 12, -3][j], 10),
    );
    // Savitzky & Golay 1964, 7-point quadratic smoothing (−2, 3, 6, 7, 6, 3, −2)/21 (from memory)
    times(savitzkyGolayCoefficients({ windowSize: 7, polynomial: 2 }), 21).forEach((v, j) =>
      expect(v).toBeCloseTo([-2, 3, 6, 7, 6, 3, -2][j], 10),
    );
    // Savitzky & Golay 1964, 5-point quadratic first derivative (−2, −1, 0, 1, 2)/10 (from memory)
    times(savitzkyGolayCoefficients({ windowSize: 5, polynomial: 2, derivative: 1 }), 10).forEach(
      (v, j) => expect(v).toBeCloseTo([-2, -1, 0, 1, 2][j], 10),
    );
  });

  it("matches SciPy savgol_coeffs(use='dot') for windows 5–11, polynomials 2–4, derivatives 0–2", () => {
    expect(reference.savgolCoeffs.length).toBe(36);
    for (const c of reference.savgolCoeffs) {
      const ours = savitzkyGolayCoefficients(c);
      // SciPy 1.10.1 savgol_coeffs, tests/reference/signal-reference.json
      ours.forEach((v, j) => expect(v).toBeCloseTo(c.coefficients[j], 9));
    }
  });
});

describe("savitzkyGolayCoefficients, worked out once per shape", () => {
  it("hands out its own copy each time: changing one leaves the next answer alone", () => {
    const shape = { windowSize: 9, polynomial: 4, derivative: 1, position: 2, spacing: 0.5 };
    const first = savitzkyGolayCoefficients(shape);
    const expected = Array.from(first);
    first.fill(123);
    expect(Array.from(savitzkyGolayCoefficients(shape))).toEqual(expected);
    // A neighbouring shape is not mistaken for it.
    expect(Array.from(savitzkyGolayCoefficients({ ...shape, spacing: 0.25 }))).not.toEqual(
      expected,
    );
  });
});

describe("savitzkyGolay", () => {
  const signal = Float64Array.from(reference.savgolFilter.signal);

  it("matches SciPy savgol_filter in modes interp and nearest, interior and edges", () => {
    for (const c of reference.savgolFilter.cases) {
      const ours = savitzkyGolay(signal, {
        windowSize: c.windowSize,
        polynomial: c.polynomial,
        derivative: c.derivative,
        spacing: c.spacing,
        edges: c.mode === "interp" ? "polynomial" : "nearest",
      });
      expect(ours.length).toBe(signal.length);
      // SciPy 1.10.1 savgol_filter, tests/reference/signal-reference.json
      ours.forEach((v, i) => expect(v).toBeCloseTo(c.output[i], 8));
    }
  });

  it("reproduces a cubic and its derivatives exactly with a cubic fit, everywhere including the edges", () => {
    const h = 0.5;
    const y = Float64Array.from({ length: 40 }, (_, i) => {
      const t = i * h;
      return 2 - t + 0.3 * t * t - 0.02 * t ** 3;
    });
    const slope = savitzkyGolay(y, { windowSize: 9, polynomial: 3, derivative: 1, spacing: h });
    const curvature = savitzkyGolay(y, { windowSize: 9, polynomial: 3, derivative: 2, spacing: h });
    slope.forEach((v, i) => expect(v).toBeCloseTo(-1 + 0.6 * i * h - 0.06 * (i * h) ** 2, 9));
    curvature.forEach((v, i) => expect(v).toBeCloseTo(0.6 - 0.12 * i * h, 9));
  });

  it("equals the windowed sum Σ w[j]·y[i − half + j] at every point, for every length and both edge modes", () => {
    // Lengths windowSize … windowSize + 15 leave every remainder of the eight-at-a-time interior loop.
    for (const windowSize of [5, 9]) {
      const half = (windowSize - 1) / 2;
      const centre = savitzkyGolayCoefficients({ windowSize, polynomial: 3 });
      for (let n = windowSize; n < windowSize + 16; n++) {
        const y = Float64Array.from({ length: n }, (_, i) => 100 * Math.sin(1.7 * i) + i * i);
        const clamp = (i: number) => y[Math.min(n - 1, Math.max(0, i))];
        const nearest = savitzkyGolay(y, { windowSize, polynomial: 3, edges: "nearest" });
        const interp = savitzkyGolay(y, { windowSize, polynomial: 3 });
        for (let i = 0; i < n; i++) {
          let expected = 0;
          for (let j = 0; j < windowSize; j++) expected += centre[j] * clamp(i - half + j);
          expect(nearest[i]).toBeCloseTo(expected, 9);
          if (i >= half && i < n - half) expect(interp[i]).toBeCloseTo(expected, 9);
        }
      }
    }
  });

  it("does not mutate its input", () => {
    const copy = Float64Array.from(signal);
    savitzkyGolay(signal, { windowSize: 7 });
    expect(Array.from(signal)).toEqual(Array.from(copy));
  });

  it("rejects ill-posed windows, polynomials and derivatives with RangeErrors", () => {
    expect(() => savitzkyGolay(signal, { windowSize: 6 })).toThrow(RangeError);
    expect(() => savitzkyGolay(signal, { windowSize: 3 })).toThrow(RangeError);
    expect(() => savitzkyGolay(signal, { windowSize: 5, polynomial: 5 })).toThrow(RangeError);
    expect(() => savitzkyGolay(signal, { windowSize: 7, polynomial: 2, derivative: 3 })).toThrow(
      RangeError,
    );
    expect(() => savitzkyGolay(signal, { windowSize: 7, polynomial: 2.5 })).toThrow(RangeError);
    expect(() => savitzkyGolay(signal, { spacing: 0 })).toThrow(RangeError);
    expect(() => savitzkyGolay(new Float64Array(4), { windowSize: 5 })).toThrow(RangeError);
    expect(() => savitzkyGolay(Float64Array.of(1, 2, NaN, 4, 5, 6, 7))).toThrow(RangeError);
    const ramp = Float64Array.from({ length: 40 }, (_, i) => i);
    for (const at of [0, 5, 17, 39]) {
      const bad = Float64Array.from(ramp);
      bad[at] = at % 2 ? -Infinity : Infinity;
      for (const edges of ["polynomial", "nearest"] as const) {
        expect(() => savitzkyGolay(bad, { edges })).toThrow(`y[${at}] is not a finite number`);
      }
    }
  });

  it("accepts finite input even when its window sums overflow (only non-finite input is refused)", () => {
    // Partial sums reach 38/35 of 1.7e308, beyond the largest double, so the overflow is really met.
    const huge = new Float64Array(20).fill(1.7e308);
    expect(() => savitzkyGolay(huge, { windowSize: 5 })).not.toThrow();
  });
});
