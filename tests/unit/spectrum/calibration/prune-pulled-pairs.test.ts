// Pairs pulled off the smooth curve of the others (a blend with an unlisted line) are set aside; the
// well-centred ones, and a pairing that is no smooth curve at all, are left as they are.
import { describe, expect, it } from "vitest";
import { prunePulledPairs } from "@/lib/spectrum/calibration/prune-pulled-pairs";
import type { LampPair } from "@/lib/spectrum/calibration";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

const pairsOnCurve = (n: number, noiseX: number, seed: number): LampPair[] => {
  const random = makeRandom(seed).uniform;
  return Array.from({ length: n }, (_, i) => {
    const wavelengthNm = 400 + (400 * (i + 0.5)) / n;
    // x(λ) of a mildly curved grating over a 2048-pixel array.
    const x =
      ((wavelengthNm - 400) / 400) * 2047 +
      60 * ((wavelengthNm - 600) / 200) ** 2 +
      noiseX * (random() - 0.5);
    return { x, wavelengthNm, peakIndex: i, lineIndex: i };
  });
};
const identity = (lambda: number) => lambda;

describe("prunePulledPairs", () => {
  it("sets aside the pairs whose peaks were pulled by a pixel", () => {
    const pairs = pairsOnCurve(20, 0.05, 3);
    pairs[4] = { ...pairs[4], x: pairs[4].x + 1.2 };
    pairs[19] = { ...pairs[19], x: pairs[19].x - 0.8 };
    const kept = prunePulledPairs(pairs, identity, [400, 800], "grating", [0, 2047]);
    expect(kept.map((p) => p.peakIndex).sort((a, b) => a - b)).toEqual(
      pairs.map((p) => p.peakIndex).filter((i) => i !== 4 && i !== 19),
    );
  });

  it("keeps every well-centred pair", () => {
    const pairs = pairsOnCurve(20, 0.05, 4);
    expect(prunePulledPairs(pairs, identity, [400, 800], "grating", [0, 2047])).toHaveLength(20);
  });

  it("sets aside at most three tenths of the pairs", () => {
    const pairs = pairsOnCurve(20, 0.05, 5).map((p, i) =>
      i % 2 === 0 ? { ...p, x: p.x + 3 * Math.sin(i) } : p,
    );
    expect(
      prunePulledPairs(pairs, identity, [400, 800], "grating", [0, 2047]).length,
    ).toBeGreaterThanOrEqual(14);
  });
});
