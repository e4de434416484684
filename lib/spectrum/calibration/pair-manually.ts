// Manual pairing: two or three pairs picked by hand are extended to a full pairing — the fallback when
// automatic pairing is not trusted and the override when the chemist knows better.
import { Matrix, solve } from "ml-matrix";
import { hypothesisShapes, pairingContext } from "./lamp-pairing-setup";
import type {
  LampLine,
  LampPair,
  LampPairingOptions,
  LampPairingResult,
  LampPeak,
} from "./lamp-pairing-types";
import { refineLampPairing } from "./refine-lamp-pairing";

/** One pair picked by hand: a peak and a line, by their indices in the arrays given. */
export interface ManualSeedPair {
  peakIndex: number;
  lineIndex: number;
}

export type PairManuallyOptions = LampPairingOptions;

/** First guess x(λ) through the seeds: a line in g(λ) for two, a parabola (grating) or α = 1 Hartmann (prism) for three. */
function seedPrediction(
  seeds: { x: number; lambda: number }[],
  options: LampPairingOptions,
): ((lambda: number) => number)[] {
  if (seeds.length === 2) {
    return hypothesisShapes(options.dispersion, options.nominalRangeNm).map((g) => {
      const b = (seeds[1].x - seeds[0].x) / (g(seeds[1].lambda) - g(seeds[0].lambda));
      const a = seeds[0].x - b * g(seeds[0].lambda);
      return (lambda: number) => a + b * g(lambda);
    });
  }
  if (options.dispersion === "grating") {
    const coefficients = solve(
      new Matrix(seeds.map((s) => [1, s.lambda, s.lambda ** 2])),
      Matrix.columnVector(seeds.map((s) => s.x)),
    ).getColumn(0);
    return [
      (lambda: number) =>
        coefficients[0] + coefficients[1] * lambda + coefficients[2] * lambda ** 2,
    ];
  }
  // λ(x0 − x) = λ0(x0 − x) + c is linear in (x0, λ0, u = λ0·x0 + c): x0·λ + λ0·x − u = λ·x.
  const [x0, lambda0, u] = solve(
    new Matrix(seeds.map((s) => [s.lambda, s.x, -1])),
    Matrix.columnVector(seeds.map((s) => s.lambda * s.x)),
  ).getColumn(0);
  const c = u - lambda0 * x0;
  return [(lambda: number) => x0 - c / (lambda - lambda0)];
}

/** Extends 2–3 hand-picked pairs to a full pairing; the seeds are kept whatever the fit says. */
export function pairManually(
  peaks: LampPeak[],
  lines: LampLine[],
  seedPairs: ManualSeedPair[],
  options: PairManuallyOptions,
): LampPairingResult {
  if (!Array.isArray(seedPairs) || seedPairs.length < 2 || seedPairs.length > 3) {
    throw new RangeError(`seedPairs must hold 2 or 3 pairs, got ${seedPairs?.length}`);
  }
  seedPairs.forEach((seed, i) => {
    if (!Number.isInteger(seed.peakIndex) || seed.peakIndex < 0 || seed.peakIndex >= peaks.length) {
      throw new RangeError(`seedPairs[${i}].peakIndex ${seed.peakIndex} is not a peak`);
    }
    if (!Number.isInteger(seed.lineIndex) || seed.lineIndex < 0 || seed.lineIndex >= lines.length) {
      throw new RangeError(`seedPairs[${i}].lineIndex ${seed.lineIndex} is not a line`);
    }
  });
  const forced = new Map(seedPairs.map((s) => [s.peakIndex, s.lineIndex]));
  if (forced.size !== seedPairs.length || new Set(forced.values()).size !== seedPairs.length) {
    throw new RangeError("seedPairs must not repeat a peak or a line");
  }
  const context = pairingContext(peaks, lines, options, forced);
  for (const l of forced.values())
    if (!context.candidateLines.includes(l)) context.candidateLines.push(l);
  const seeds = seedPairs.map((s) => ({
    x: peaks[s.peakIndex].x,
    lambda: lines[s.lineIndex].wavelengthNm,
  }));

  // The first pairs carry no centre σ (unlike toLampPair's): the first fit weighs them all alike.
  const unweightedPair = (p: number, l: number): LampPair => ({
    x: peaks[p].x,
    wavelengthNm: lines[l].wavelengthNm,
    species: lines[l].species,
    lineId: lines[l].id,
    peakIndex: p,
    lineIndex: l,
  });
  let result: LampPairingResult | undefined;
  for (const predict of seedPrediction(seeds, options)) {
    const initial: LampPair[] = [];
    const taken = new Set(forced.keys());
    for (const l of context.candidateLines) {
      if ([...forced.values()].includes(l)) continue;
      const x = predict(lines[l].wavelengthNm);
      if (!(x >= context.domain[0] && x <= context.domain[1])) continue;
      let nearest = -1;
      peaks.forEach((peak, p) => {
        if (!taken.has(p) && (nearest < 0 || Math.abs(peak.x - x) < Math.abs(peaks[nearest].x - x)))
          nearest = p;
      });
      if (nearest >= 0 && Math.abs(peaks[nearest].x - x) <= 6 * context.toleranceX) {
        taken.add(nearest);
        initial.push(unweightedPair(nearest, l));
      }
    }
    for (const [p, l] of forced) initial.push(unweightedPair(p, l));
    const attempt = refineLampPairing(context, initial);
    if (!result || attempt.confidence > result.confidence) result = attempt;
  }
  return result!;
}
