// The dip between two lines of one Gaussian instrument profile, which decides whether a fainter
// companion could have shown as a peak of its own or hides in the stronger line.
import { describe, expect, it } from "vitest";
import { dipIsShallow, twoLineDip } from "@/lib/spectrum/matching/two-line-dip";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

const FOUR_LN2 = 4 * Math.LN2;
const gaussian = (x: number) => Math.exp(-FOUR_LN2 * x * x);

describe("twoLineDip", () => {
  it("has no dip for equal lines inside the Sparrow limit and one beyond it", () => {
    // Two equal Gaussians merge into one flat top at a separation of 2σ = 0.849 FWHM (the Sparrow
    // limit; common practice).
    expect(twoLineDip(0.8, 1)).toBe(0);
    expect(twoLineDip(0.95, 1)).toBeGreaterThan(0);
  });

  it("matches the closed form for equal lines two FWHM apart", () => {
    // The valley lies midway; each line's maximum carries the other's far wing.
    const valley = 2 * gaussian(1);
    const top = 1 + gaussian(2);
    expect(twoLineDip(2, 1)).toBeCloseTo(top - valley, 3);
  });

  it("grows with the separation and with the companion's height", () => {
    expect(twoLineDip(1.25, 0.5)).toBeLessThan(twoLineDip(1.5, 0.5));
    expect(twoLineDip(1.5, 0.25)).toBeLessThan(twoLineDip(1.5, 0.5));
    // The sodium D pair at 0.46 nm resolution (0.597 nm apart, D1 half of D2): a dip of a few
    // per cent of D2, under 6 σ at an SNR of 40.
    expect(40 * twoLineDip(0.597 / 0.464, 0.5)).toBeLessThan(6);
  });

  it("is 0 for a companion stronger than the line or a separation that is no separation", () => {
    expect(twoLineDip(1.5, 1.5)).toBe(0);
    expect(twoLineDip(0, 0.5)).toBe(0);
    expect(twoLineDip(Number.NaN, 0.5)).toBe(0);
  });

  it("gives the continuous dip when finely sampled, and never more than it", () => {
    expect(twoLineDip(2, 1, 40)).toBeCloseTo(twoLineDip(2, 1), 2);
    expect(twoLineDip(1.35, 0.37, 40)).toBeCloseTo(twoLineDip(1.35, 0.37), 2);
    for (const samples of [2.2, 2.5, 3, 4, 6]) {
      for (const [separation, ratio] of [
        [1.35, 0.37],
        [2, 1],
        [1.6, 0.5],
      ]) {
        expect(twoLineDip(separation, ratio, samples)).toBeLessThanOrEqual(
          twoLineDip(separation, ratio) + 1e-12,
        );
      }
    }
  });

  it("takes the continuous dip for very fine or senseless sampling, at no cost", () => {
    expect(twoLineDip(1.35, 0.37, 1e9)).toBe(twoLineDip(1.35, 0.37));
    expect(twoLineDip(1.35, 0.37, Number.POSITIVE_INFINITY)).toBe(twoLineDip(1.35, 0.37));
    expect(twoLineDip(1.35, 0.37, Number.NaN)).toBe(twoLineDip(1.35, 0.37));
    expect(twoLineDip(1.35, 0.37, 0)).toBe(twoLineDip(1.35, 0.37));
  });

  it("is 0 where 2.5 samples per FWHM can fall so that no sample tops the companion", () => {
    // The Na D pair at 0.44 nm resolution and 0.18 nm per sample (D1 0.37 of D2, 1.35 FWHM away): the
    // continuous profile dips by 6 % of D2, but the peak finder's test found D1 at some placings of the
    // grid and at others not at all (tests/unit/spectrum/peaks/narrow-neighbours.test.ts).
    expect(twoLineDip(1.35, 0.37)).toBeGreaterThan(0.05);
    expect(twoLineDip(1.35, 0.37, 2.5)).toBe(0);
    // Sampled five times per FWHM the dip shows at every placing.
    expect(twoLineDip(1.35, 0.37, 5)).toBeGreaterThan(0.03);
  });

  it("sees a companion far off as its own line: the dip is its whole height, as sampled", () => {
    // Lines a hundred FWHM apart do not touch: the valley between them is empty, and the companion's
    // top shows as its highest sample, at worst half a step off its centre (the continuous profile is
    // walked in 400 steps over 1.5 separations).
    for (const [separation, ratio] of [
      [100, 0.5],
      [12, 0.2],
    ]) {
      for (const samples of [undefined, 2.5, 7.4]) {
        const step = samples === undefined ? (1.5 * separation) / 400 : 1 / samples;
        const dip = twoLineDip(separation, ratio, samples);
        expect(dip).toBeLessThanOrEqual(ratio);
        expect(dip).toBeGreaterThanOrEqual(ratio * gaussian(step / 2) - 1e-12);
      }
    }
  });
});

describe("dipIsShallow", () => {
  it("answers as height × twoLineDip < depth does, near and far, sampled or not", () => {
    const random = makeRandom(41);
    let shallow = 0;
    for (let i = 0; i < 3000; i++) {
      const separation =
        random.uniform() < 0.2 ? 3 + 200 * random.uniform() : 0.3 + 3 * random.uniform();
      const ratio = random.uniform();
      const samples = random.uniform() < 0.2 ? undefined : 1.5 + 25 * random.uniform();
      const height = 5 + 300 * random.uniform();
      const expected = height * twoLineDip(separation, ratio, samples) < 6;
      expect(dipIsShallow(separation, ratio, samples, height, 6)).toBe(expected);
      if (expected) shallow++;
    }
    // Both answers occur often enough for the comparison to mean something.
    expect(shallow).toBeGreaterThan(500);
    expect(shallow).toBeLessThan(2500);
  });
});
