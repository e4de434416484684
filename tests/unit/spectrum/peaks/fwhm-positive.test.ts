// Every peak the finder returns has a positive, finite FWHM: calibration divides by it and compares
// widths, and a negative width once reached the client as an HTTP 500. Property test over spikes,
// clipped tops, flat stretches, negative baselines and noise (FC_SEED explores other seeds).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { findPeaks } from "@/lib/spectrum/peaks";

const sample = fc.oneof(
  fc.double({ min: -50, max: 50, noNaN: true }),
  fc.double({ min: 0, max: 1e5, noNaN: true }),
  fc.constantFrom(0, 1, 65535),
);

describe("findPeaks widths", () => {
  it("are positive and finite for any signal", () => {
    fc.assert(
      fc.property(
        fc.array(sample, { minLength: 16, maxLength: 120 }),
        fc.double({ min: 0.001, max: 5, noNaN: true }),
        fc.boolean(),
        fc.option(fc.double({ min: 10, max: 70000, noNaN: true }), { nil: undefined }),
        (values, step, smoothing, clip) => {
          const y = Float64Array.from(values, (v) => (clip !== undefined ? Math.min(v, clip) : v));
          const x = Float64Array.from(y, (_, i) => 100 + i * step);
          for (const source of ["lamp", "flame"] as const) {
            const peaks = findPeaks(x, y, {
              source,
              smoothing: smoothing ? undefined : false,
              minSnr: 2,
            });
            for (const p of peaks) {
              expect(p.fwhm).toBeGreaterThan(0);
              expect(Number.isFinite(p.fwhm)).toBe(true);
            }
          }
        },
      ),
      { numRuns: 400 },
    );
  });

  it("are positive for one-sample spikes on a flat or sloping floor", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 20, max: 200 }),
        fc.array(fc.tuple(fc.nat(), fc.double({ min: 1, max: 1e5, noNaN: true })), {
          minLength: 1,
          maxLength: 6,
        }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        (n, spikes, slope) => {
          const y = Float64Array.from({ length: n }, (_, i) => 100 + slope * i);
          for (const [at, height] of spikes) y[at % n] += height;
          const x = Float64Array.from(y, (_, i) => i);
          for (const p of findPeaks(x, y, { source: "lamp" })) expect(p.fwhm).toBeGreaterThan(0);
        },
      ),
      { numRuns: 300 },
    );
  });
});
