// The noise model σ² = σ_read² + level/gain: recovered from a sloped continuum with Poisson noise, and
// absent (one global σ, today's numbers) when the noise does not grow with the level.
import { describe, it, expect } from "vitest";
import { pickPeaks } from "@/lib/spectrum/peaks/pick-peaks";
import { estimateNoise, estimateNoiseProfile, prepareSignal } from "@/lib/spectrum/signal";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";

const N = 2048;
const READ_NOISE = 5;
const x = Float64Array.from({ length: N }, (_, i) => i);
/** A continuum rising from 100 to 3000 counts across the array (a flame's red wing on a prism). */
const level = Float64Array.from({ length: N }, (_, i) => 100 + 2900 * (i / (N - 1)) ** 2);
/** The detector's truth at gain 1 count per photoelectron: σ² = σ_read² + level (common practice for CCD/CMOS). */
const trueSigma = (counts: number) => Math.sqrt(READ_NOISE ** 2 + counts);

type Line = { index: number; height: number };
const gaussian = (i: number, line: Line) =>
  line.height * Math.exp(-0.5 * ((i - line.index) / 1.5) ** 2);

function poissonSpectrum(seed: number, lines: Line[] = []): Float64Array {
  const random = makeRandom(seed);
  return Float64Array.from({ length: N }, (_, i) => {
    const mean = lines.reduce((sum, line) => sum + gaussian(i, line), level[i]);
    return random.poisson(mean) + READ_NOISE * random.normal();
  });
}

/** Relative errors of `profile` against the truth at each sample: [root mean square, worst]. */
function relativeErrors(profile: Float64Array): [number, number] {
  let sumSquares = 0;
  let worst = 0;
  for (let i = 0; i < N; i++) {
    const error = Math.abs(profile[i] / trueSigma(level[i]) - 1);
    sumSquares += error * error;
    worst = Math.max(worst, error);
  }
  return [Math.sqrt(sumSquares / N), worst];
}

describe("estimateNoiseProfile", () => {
  // Each 64-sample block's MAD-based σ carries ~15 % relative error; the fit over 32 blocks brings
  // the profile to within 15 % RMS, and 30 % at its worst sample (the array's ends, where the fit
  // is least constrained).
  it("recovers σ(level) of Poisson plus read noise on a sloped continuum, within 15 % RMS and 30 % everywhere", () => {
    for (const seed of [1, 2, 3]) {
      const profile = estimateNoiseProfile(poissonSpectrum(seed), level);
      expect(profile, `seed ${seed}`).not.toBeNull();
      const [rms, worst] = relativeErrors(profile!);
      expect(rms, `seed ${seed}`).toBeLessThan(0.15);
      expect(worst, `seed ${seed}`).toBeLessThan(0.3);
    }
  });

  it("recovers it through prepareSignal, from the prepared continuum with lines on top", () => {
    const lines = Array.from({ length: 12 }, (_, j) => ({
      index: 80 + 160 * j,
      height: 400 + 100 * j,
    }));
    const signal = prepareSignal(x, poissonSpectrum(7, lines), { source: "flame" });
    expect(signal.noiseProfile).toBeDefined();
    const [rms, worst] = relativeErrors(signal.noiseProfile!);
    expect(rms).toBeLessThan(0.15);
    expect(worst).toBeLessThan(0.3);
  });

  it("returns null for noise that does not grow with the level, so prepareSignal keeps one σ", () => {
    for (const seed of [1, 2, 3]) {
      const random = makeRandom(seed);
      const y = Float64Array.from(level, (counts) => counts + 20 * random.normal());
      expect(estimateNoiseProfile(y, level), `seed ${seed}`).toBeNull();
      const signal = prepareSignal(x, y, { source: "flame" });
      expect(signal.noiseProfile).toBeUndefined();
      expect(signal.noise).toBe(estimateNoise(y));
    }
  });

  it("returns null with fewer blocks than minBlocks, and when told not to model", () => {
    const y = poissonSpectrum(4);
    expect(estimateNoiseProfile(y.subarray(0, 7 * 64), level.subarray(0, 7 * 64))).toBeNull();
    expect(prepareSignal(x, y, { noiseProfile: false }).noiseProfile).toBeUndefined();
    expect(prepareSignal(x, y, { noise: 10 }).noiseProfile).toBeUndefined();
  });

  it("rejects bad input", () => {
    const y = poissonSpectrum(5);
    expect(() => estimateNoiseProfile(y, level.subarray(1))).toThrow(RangeError);
    expect(() => estimateNoiseProfile(y, level, { blockSize: 4 })).toThrow(RangeError);
    expect(() => estimateNoiseProfile(y, level, { minBlocks: 2.5 })).toThrow(RangeError);
    expect(() => estimateNoiseProfile(y, level, { minSpread: 0.5 })).toThrow(RangeError);
    expect(() =>
      estimateNoiseProfile(Float64Array.of(1, NaN, 3), Float64Array.of(1, 2, 3)),
    ).toThrow(RangeError);
  });
});

describe("pickPeaks with a noise profile", () => {
  // Two equal lines, one on the faint continuum (σ ≈ 11 counts) and one on the bright end (σ ≈ 53).
  const lines: Line[] = [
    { index: 300, height: 800 },
    { index: 1900, height: 800 },
  ];
  const y = poissonSpectrum(9, lines);

  it("gives the line on the bright continuum the lower SNR its shot noise allows, within 25 %", () => {
    const signal = prepareSignal(x, y, { source: "flame" });
    const peaks = pickPeaks(x, signal);
    for (const line of lines) {
      const peak = peaks.find((p) => Math.abs(p.x - line.index) < 2);
      expect(peak, `line at ${line.index}`).toBeDefined();
      // The SNR a detector physicist would quote: height over the noise of the background under it.
      const expected = peak!.height / trueSigma(level[line.index]);
      expect(Math.abs(peak!.snr / expected - 1), `line at ${line.index}`).toBeLessThan(0.25);
    }
    const [faint, bright] = lines.map((line) => peaks.find((p) => Math.abs(p.x - line.index) < 2)!);
    expect(bright.snr).toBeLessThan(faint.snr / 3);
    // One global σ would give both the same SNR per count of height, overstating the bright one.
    const global = pickPeaks(x, prepareSignal(x, y, { source: "flame", noiseProfile: false }));
    const globalBright = global.find((p) => Math.abs(p.x - lines[1].index) < 2)!;
    expect(globalBright.snr).toBeGreaterThan(1.5 * bright.snr);
  });

  it("reports no noise bumps on the bright end, where one global σ does", () => {
    const y = poissonSpectrum(10);
    const local = pickPeaks(x, prepareSignal(x, y, { source: "flame" }));
    const global = pickPeaks(x, prepareSignal(x, y, { source: "flame", noiseProfile: false }));
    expect(local).toEqual([]);
    expect(global.length).toBeGreaterThan(0);
  });
  // Theil–Sen visits every pair of blocks: a million samples in 64-sample blocks would be 134
  // million slopes (more than a JavaScript array holds). Long arrays get wider blocks instead, and
  // the profile is as good or better, since each wider block's σ is more precise.
  it("fits a million-sample array through at most maxBlocks widened blocks, within 10 % RMS", () => {
    const n = 1_048_576;
    const longLevel = Float64Array.from({ length: n }, (_, i) => 100 + 2900 * (i / (n - 1)) ** 2);
    const random = makeRandom(11);
    const counts = Float64Array.from(
      { length: n },
      (_, i) => random.poisson(longLevel[i]) + READ_NOISE * random.normal(),
    );
    const profile = estimateNoiseProfile(counts, longLevel);
    expect(profile).not.toBeNull();
    let sumSquares = 0;
    for (let i = 0; i < n; i += 97) sumSquares += (profile![i] / trueSigma(longLevel[i]) - 1) ** 2;
    expect(Math.sqrt(sumSquares / Math.ceil(n / 97))).toBeLessThan(0.1);
    expect(() => estimateNoiseProfile(counts, longLevel, { maxBlocks: 4 })).toThrow(/maxBlocks/);
  }, 60_000);
});
