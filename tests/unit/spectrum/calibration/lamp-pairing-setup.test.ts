// The first-guess axes of a prism's blind search. A prism puts a wavelength at x = a + b·g(λ) with g
// nearly straight only when g follows both the glass's dispersion and the deviation's own curvature:
// a dense flint's exit angle grows steeply in the blue. Checked against the realistic-lamp generator
// (tests/support/realistic-lamp.ts), whose prism is its own code (Snell's law at both faces, an
// equilateral prism at minimum deviation, a camera imaging tan of the deviation).
import { describe, expect, it } from "vitest";
import {
  hartmannPoleOfGlass,
  hypothesisShapes,
  nominalPrismShape,
} from "@/lib/spectrum/calibration/lamp-pairing-setup";
import { realisticLamp } from "../../../support/realistic-lamp";

/** Largest miss of the best straight line x = a + b·g(λ) through the lamp's true axis, in matching tolerances. */
function straightness(seed: number, glass: string, g: (nm: number) => number): number {
  const lamp = realisticLamp(seed, { dispersion: "prism", glass, pixels: 2048 });
  const last = lamp.x.length - 1;
  const [low, high] = lamp.statedRangeNm;
  const toleranceX = (0.5 * lamp.resolutionNm) / ((high - low) / last);
  const xs = Array.from({ length: 61 }, (_, i) => (last * i) / 60);
  const gs = xs.map((x) => g(lamp.wavelengthAt(x)));
  const mean = (v: number[]) => v.reduce((s, a) => s + a, 0) / v.length;
  const [mg, mx] = [mean(gs), mean(xs)];
  const b =
    gs.reduce((s, v, i) => s + (v - mg) * (xs[i] - mx), 0) /
    gs.reduce((s, v) => s + (v - mg) ** 2, 0);
  return Math.max(...xs.map((x, i) => Math.abs(x - (mx + b * (gs[i] - mg))))) / toleranceX;
}

describe("nominalPrismShape", () => {
  for (const [seed, glass] of [
    [11, "N-SF11"],
    [12, "F2"],
    [13, "N-BK7"],
  ] as const) {
    it(`straightens a ${glass} prism to about a tolerance, where n(λ) alone leaves tens (lamp ${seed})`, () => {
      const range = realisticLamp(seed, { dispersion: "prism", glass, pixels: 2048 }).statedRangeNm;
      const pole = hartmannPoleOfGlass(glass, range);
      const nominal = straightness(seed, glass, nominalPrismShape(glass, range));
      const hartmann = straightness(seed, glass, (nm) => 1 / (nm - pole));
      expect(nominal).toBeLessThan(2);
      if (glass !== "N-BK7") expect(hartmann).toBeGreaterThan(10);
    });
  }
});

describe("hypothesisShapes for a prism", () => {
  it("offers one axis per catalogue glass that serves the range, N-BK7 first", () => {
    const shapes = hypothesisShapes("prism", [400, 800]);
    expect(shapes.length).toBeGreaterThan(5);
    const bk7 = nominalPrismShape("N-BK7", [400, 800]);
    expect(shapes[0](500)).toBeCloseTo(bk7(500), 12);
    for (const shape of shapes) expect(Number.isFinite(shape(380))).toBe(true);
  });
});
