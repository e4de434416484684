// Whether a few pairs at an end of a pairing, beyond a wide gap, were foretold by the other pairs:
// a model of the rest puts each of their lines inside a window (a tolerance, three statistical σ and
// the model-form part, as the end-pairs check measures it), on the very peak the pair took, with no
// other peak inside that window and no other lamp line whose own window holds that peak. Such pairs do
// not decide the calibration at their end alone — the rest of the pairs chose them, uniquely — as long
// as their centres are sound: a peak widened or split by a neighbour, or cut by the array's edge, is
// off by a pull that would be the calibration's error there. Pairs that only fit themselves (a
// cluster shifted by one lamp line, which a flexible model bends onto) are not foretold: the rest
// cannot put their lines within one peak of where they are.
import { soundCentres } from "./centre-uncertainty";
import { elementOfSpecies } from "./element-of-species";
import { growthDegree } from "./growth-degree";
import type { LampPair } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";
import { fitStraightenedPolynomial } from "./straightened-polynomial";
import { usableLampPeaks } from "./search-lamp-pairing";

/**
 * A line this much weaker than the pair's line, of the same element, is no rival for its peak (as
 * growth rules, lamp tables being rough by a factor of a few).
 */
const WEAK_RIVAL_RATIO = 0.05;

/** Where a model of some pairs puts a line, and how far from there it may land. */
export interface PairsPrediction {
  predictX: (wavelengthNm: number) => number;
  /** A tolerance, three statistical σ and the next lower degree's disagreement (the model-form part). */
  windowX: (wavelengthNm: number) => number;
  /** Whether a lower degree measured the model-form part (a straight line has none to compare with). */
  formMeasured: boolean;
}

/**
 * A polynomial of `pairs` in the straightened axis, of the degree growth gives their support, with
 * its prediction window; null when the pairs do not determine it.
 */
export function predictionOfPairs(
  context: PairingContext,
  pairs: readonly LampPair[],
): PairsPrediction | null {
  const g = context.straighten;
  const gRange: [number, number] = [g(context.nominalRangeNm[0]), g(context.nominalRangeNm[1])];
  const xs = pairs.map((p) => p.x);
  const covered = (Math.max(...xs) - Math.min(...xs)) / (context.domain[1] - context.domain[0]);
  const degree = Math.max(1, growthDegree(pairs.length, covered, context.dispersion));
  const model = fitStraightenedPolynomial(pairs, g, gRange, degree);
  if (!model) return null;
  const lower = degree > 1 ? fitStraightenedPolynomial(pairs, g, gRange, degree - 1) : null;
  return {
    predictX: model.predictX,
    windowX: (lambda) => {
      const form = lower ? Math.abs(lower.predictX(lambda) - model.predictX(lambda)) : 0;
      return context.toleranceX + 3 * model.sigmaX(lambda) + form;
    },
    formMeasured: lower !== null,
  };
}

/** True when a model of `pairs` without `group` foretells every pair of `group` uniquely. */
export function predictedByTheRest(
  context: PairingContext,
  pairs: readonly LampPair[],
  group: readonly LampPair[],
): boolean {
  const inGroup = new Set(group);
  const rest = pairs.filter((p) => !inGroup.has(p));
  if (group.length === 0 || rest.length < 3) return false;
  const prediction = predictionOfPairs(context, rest);
  // Without a lower degree to measure the model's form by, its window would claim a certainty the
  // rest does not have.
  if (!prediction?.formMeasured) return false;
  const { predictX, windowX } = prediction;
  // Whichever route paired them: a peak wider than its clean neighbours, split from one or cut by the
  // array's edge has a pulled centre, and a pair beyond a gap carries its pull into the calibration there.
  const soundCentre = soundCentres(context.peaks, rest);
  const usable = usableLampPeaks(context.peaks);
  const pairedLines = new Set(pairs.map((p) => p.lineIndex));
  // A line under WEAK_RIVAL_RATIO of its element's strongest candidate may show no peak of its own, and
  // the peak in the rest's window can be an unlisted line's: such a line is foretold only within a
  // matching tolerance of where the rest put it. Hg I 690.746 nm, alone beyond 579 nm at a hundredth
  // of an Hg lamp's strongest line, was paired so on an N-BK7 prism, an unlisted line 1.6 line widths
  // off, and the calibration was 1 nm off there. Over 3,500 blind instruments (the development sweep;
  // fresh seeds 15000000–15300000 and 16000000–16200000) this took 2 silent wrongs away (Hg lamps on
  // prisms; one is now right, one left to check), sent 3 right pairings to check and made 1 other
  // right. Two more such Hg pairs, 0.4 and 0.8 line widths off, lay within their tolerance of the
  // prediction and remain.
  const strongest = new Map<string, number>();
  for (const l of context.candidateLines) {
    const element = elementOfSpecies(context.lines[l].species);
    strongest.set(element, Math.max(strongest.get(element) ?? 0, context.lines[l].intensity));
  }
  return group.every((pair) => {
    if (!soundCentre(pair)) return false;
    const line = context.lines[pair.lineIndex];
    const weak =
      line.intensity < WEAK_RIVAL_RATIO * (strongest.get(elementOfSpecies(line.species)) ?? 0);
    const predicted = predictX(line.wavelengthNm);
    if (weak && !(Math.abs(pair.x - predicted) <= context.toleranceX)) return false;
    const window = windowX(line.wavelengthNm);
    if (!(Math.abs(pair.x - predicted) <= window)) return false;
    const otherPeak = usable.some(
      (p) => p !== pair.peakIndex && Math.abs(context.peaks[p].x - predicted) <= window,
    );
    if (otherPeak) return false;
    return !context.candidateLines.some((l) => {
      if (l === pair.lineIndex || pairedLines.has(l)) return false;
      const rival = context.lines[l];
      if (
        elementOfSpecies(rival.species) === elementOfSpecies(line.species) &&
        rival.intensity < WEAK_RIVAL_RATIO * line.intensity
      )
        return false;
      return Math.abs(predictX(rival.wavelengthNm) - pair.x) <= windowX(rival.wavelengthNm);
    });
  });
}
