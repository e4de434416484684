// The blind search of automatic lamp pairing, knowing only the nominal range and the kind of
// dispersion. Short-baseline hypotheses first: two strong peaks a few per cent of the array apart,
// paired with two lamp lines that the nominal range puts near them at a plausible local dispersion,
// are a straight line that holds over that short stretch even on a curved grating (in the straightened
// axis of a prism); each is scored by the lines it lands on a peak nearby, each landing by how close it
// falls (between the anchors a right hypothesis lands its lines within a fraction of a tolerance, chance
// ones anywhere in the window: where a gas is dense in lines and the array in unlisted peaks, counting
// every landing in the window alike ranked chance hypotheses first). The best few are then grown
// outward over the whole array (growPairsOutward), and the grown pairings are compared: the best is
// kept, and the best one that disagrees with it is reported as its rival, so that two pairings that
// explain the spectrum about equally well are shown to a person rather than decided by chance.
import { EXPECTED_PEAK_REACH } from "./expected-peak-reach";
import type { DispersionKind } from "../types";
import { growPairsOutward, type GrowPairsOutwardInput } from "./grow-pairs-outward";
import { elementOfSpecies } from "./element-of-species";
import { growthDegree } from "./growth-degree";
import type { LampLine, LampPair, LampPeak } from "./lamp-pairing-types";
import { lowerBound } from "../matching/lower-bound";
import { landingCloseness } from "./landing-closeness";
import { toLampPair } from "./to-lamp-pair";
import { typicalPeakFwhm } from "./typical-peak-fwhm";
import { fitStraightenedPolynomial } from "./straightened-polynomial";
import { percentileRanks } from "./percentile-ranks";

export interface SearchLampPairingInput {
  peaks: readonly LampPeak[];
  lines: readonly LampLine[];
  candidateLines: readonly number[];
  dispersion: DispersionKind;
  domain: [number, number];
  nominalRangeNm: [number, number];
  toleranceX: number;
  /** The straightening axes to try (one for a grating; a crown's and a flint's for a prism). */
  shapes: readonly ((wavelengthNm: number) => number)[];
}

export interface SearchLampPairingOptions {
  /**
   * Strongest peaks that may anchor a hypothesis.
   * @default 30
   */
  anchorPeaks?: number;
  /**
   * Strongest lines that may anchor a hypothesis.
   * @default 45
   */
  anchorLines?: number;
  /**
   * Hypotheses grown, best first.
   * @default 40
   */
  maxGrown?: number;
}

/** A grown pairing and how well it explains the spectrum. */
export interface GrownPairing {
  pairs: LampPair[];
  /** Index of the shape (straightening axis) it was grown in. */
  shape: number;
  /** Pairs, each weighted by how close it sits to the pairing's model, less half the strong lines the model puts inside the paired stretch without a peak. */
  score: number;
  /** Strong lines inside the paired stretch with no peak near where the model puts them. */
  missingStrong: number;
  /** Share of the array between the outermost pairs. */
  coveredFraction: number;
}

export interface LampPairingSearch {
  best: GrownPairing | null;
  /** The best grown pairing that disagrees with `best` (shares under half its pairs). */
  rival: GrownPairing | null;
}

/**
 * A short-baseline hypothesis: a straight line in shape `shape`'s axis through `anchorPeak` and
 * `anchorLine` at `slope`. Only its score is kept (with at least three pairs); its pairs are listed
 * again for the few that are grown (a dense lamp on a prism makes millions of hypotheses).
 */
interface Hypothesis {
  shape: number;
  anchorPeak: number;
  anchorLine: number;
  slope: number;
  separation: number;
  score: number;
}

/** How far the nominal range may misplace a line, in shares of the array: ±3 % stated-range error at each end and a few per cent of curvature (a prism's straightening is rougher). */
const PLACEMENT_SHARE: Record<DispersionKind, number> = { grating: 0.12, prism: 0.2 };
/** Local dispersion against the nominal mean: a curved grating's varies by about ±25 %; a prism's, straightened by the wrong glass, by more. */
const SLOPE_RATIO: Record<DispersionKind, [number, number]> = {
  grating: [0.7, 1.45],
  prism: [0.45, 2.2],
};
/** Anchor peaks lie this share of the array apart: far enough to fix a dispersion, close enough for a straight line to hold. */
const ANCHOR_SEPARATION: [number, number] = [0.03, 0.14];

/** Peaks narrower than this share of the typical peak are hot pixels or spikes, not lines. */
const MIN_WIDTH_SHARE = 0.45;

/** Indices of the peaks that can be lamp lines: hot pixels (far narrower than the typical peak) left out. */
export function usableLampPeaks(peaks: readonly LampPeak[]): number[] {
  const typical = typicalPeakFwhm(peaks, 3);
  if (typical === undefined) return peaks.map((_, i) => i);
  return peaks
    .map((_, i) => i)
    .filter((i) => !(peaks[i].fwhm !== undefined && peaks[i].fwhm! < MIN_WIDTH_SHARE * typical));
}

/** Hypotheses sorted in one batch: growth rarely looks further than the first few hundred. */
const BEST_FIRST_BATCH = 4096;

/**
 * `hypotheses` best score first, ties in their given order (as a stable sort would give them), sorted a
 * batch at a time: growth stops after a few dozen, so sorting a million hypotheses whole is wasted.
 */
function* bestFirst(hypotheses: readonly Hypothesis[]): Generator<Hypothesis> {
  const scores = Float64Array.from(hypotheses, (h) => h.score).sort();
  let above = Infinity;
  let remaining = scores.length;
  while (remaining > 0) {
    // The lowest score of this batch: every hypothesis at or above it and below the last batch's.
    const floor = scores[Math.max(0, remaining - BEST_FIRST_BATCH)];
    const batch = hypotheses.filter((h) => h.score >= floor && h.score < above);
    batch.sort((a, b) => b.score - a.score);
    yield* batch;
    remaining -= batch.length;
    above = floor;
  }
}

export function searchLampPairing(
  input: SearchLampPairingInput,
  options: SearchLampPairingOptions = {},
): LampPairingSearch {
  const { anchorPeaks = 30, anchorLines = 45, maxGrown = 40 } = options;
  const { peaks, lines, candidateLines, dispersion, domain, nominalRangeNm, toleranceX, shapes } =
    input;
  const usable = usableLampPeaks(peaks);
  if (usable.length < 4 || candidateLines.length < 4) return { best: null, rival: null };
  const spanX = domain[1] - domain[0];
  const usableByX = usable.slice().sort((a, b) => peaks[a].x - peaks[b].x);
  const usableX = usableByX.map((p) => peaks[p].x);
  const nearestUsable = (x: number): number => {
    const low = lowerBound(usableX, x);
    if (low === 0) return 0;
    if (low === usableX.length) return low - 1;
    return x - usableX[low - 1] < usableX[low] - x ? low - 1 : low;
  };
  // Percentile ranks of the usable peaks' heights and the candidate lines' intensities, by index.
  const peakRankOf = new Float64Array(peaks.length);
  percentileRanks(usable.map((p) => peaks[p].height)).forEach(
    (r, k) => (peakRankOf[usable[k]] = r),
  );
  const lineRankOf = new Float64Array(lines.length);
  percentileRanks(candidateLines.map((l) => lines[l].intensity)).forEach(
    (r, k) => (lineRankOf[candidateLines[k]] = r),
  );
  const strongPeaks = usable
    .slice()
    .sort((a, b) => peaks[b].height - peaks[a].height)
    .slice(0, anchorPeaks)
    .sort((a, b) => peaks[a].x - peaks[b].x);
  const strongLines = candidateLines
    .slice()
    .sort((a, b) => lines[b].intensity - lines[a].intensity)
    .slice(0, anchorLines);
  const placement = PLACEMENT_SHARE[dispersion] * spanX;
  const [slowest, fastest] = SLOPE_RATIO[dispersion];
  const scoreTolerance = 1.5 * toleranceX;

  const hypotheses: Hypothesis[] = [];
  // Each candidate line's place in each shape's axis, by line index.
  const gOfShape = shapes.map((g) => {
    const values = new Float64Array(lines.length);
    for (const l of candidateLines) values[l] = g(lines[l].wavelengthNm);
    return values;
  });
  // Where a shape's axis runs one way along the candidate lines (it does when they are in wavelength
  // order), a hypothesis's window is found by bisection instead of a pass over every line. `ascending`
  // holds the axis values in candidate order, negated when they fall.
  const windows = shapes.map((_, shape) => {
    const values = Float64Array.from(candidateLines, (l) => gOfShape[shape][l]);
    const rising = values.every((v, k) => k === 0 || v > values[k - 1]);
    const falling = values.every((v, k) => k === 0 || v < values[k - 1]);
    if (!rising && !falling) return null;
    return { sign: rising ? 1 : -1, ascending: rising ? values : values.map((v) => -v) };
  });
  // Peaks taken by a hypothesis's lines, marked with the hypothesis's stamp (no set per hypothesis).
  const takenStamp = new Int32Array(peaks.length);
  let stamp = 0;
  shapes.forEach((g, shape) => {
    const gLow = g(nominalRangeNm[0]);
    const gHigh = g(nominalRangeNm[1]);
    const gValues = gOfShape[shape];
    for (const direction of [1, -1] as const) {
      const nominalSlope = (direction * spanX) / (gHigh - gLow);
      const nominalX = (l: number) =>
        direction === 1
          ? domain[0] + (gValues[l] - gLow) * (spanX / (gHigh - gLow))
          : domain[1] - (gValues[l] - gLow) * (spanX / (gHigh - gLow));
      const near = strongPeaks.map((p) =>
        strongLines.filter((l) => Math.abs(nominalX(l) - peaks[p].x) <= placement),
      );
      for (let i = 0; i < strongPeaks.length; i++) {
        for (let j = i + 1; j < strongPeaks.length; j++) {
          const pi = strongPeaks[i];
          const pj = strongPeaks[j];
          const separation = peaks[pj].x - peaks[pi].x;
          if (separation < ANCHOR_SEPARATION[0] * spanX) continue;
          if (separation > ANCHOR_SEPARATION[1] * spanX) break;
          for (const la of near[i]) {
            for (const lb of near[j]) {
              if (la === lb) continue;
              const slope = separation / (gValues[lb] - gValues[la]);
              const ratio = slope / nominalSlope;
              if (!(ratio >= slowest && ratio <= fastest)) continue;
              const local = scoreLocal(shape, pi, la, slope, separation);
              // Fewer than three pairs is never grown: not kept.
              if (local.count < 3) continue;
              hypotheses.push({
                shape,
                anchorPeak: pi,
                anchorLine: la,
                slope,
                separation,
                score: local.score,
              });
            }
          }
        }
      }
    }
  });

  /**
   * Lines a straight line through the anchors lands on a peak, near the anchors only: the score (each
   * landing weighed by its closeness, `landingCloseness`, and by how well the
   * line's strength rank matches the peak's) and the number of pairs, and the pairs themselves into
   * `pairs` when given.
   */
  function scoreLocal(
    shape: number,
    anchorPeak: number,
    anchorLine: number,
    slope: number,
    separation: number,
    pairs?: LampPair[],
  ): { score: number; count: number } {
    const gValues = gOfShape[shape];
    const x0 = peaks[anchorPeak].x;
    const g0 = gValues[anchorLine];
    // Between the anchors and half their separation beyond either (the second anchor is at x0 + separation).
    const from = x0 - 0.5 * separation;
    const to = x0 + 1.5 * separation;
    let score = 0;
    let count = 0;
    stamp++;
    let first = 0;
    let last = candidateLines.length;
    const window = windows[shape];
    if (window) {
      // The lines whose x can fall in [from, to], a little wider than exact (the x test below decides).
      const end0 = window.sign * (g0 + (from - x0) / slope);
      const end1 = window.sign * (g0 + (to - x0) / slope);
      const margin = 1e-9 * (Math.abs(end0) + Math.abs(end1) + 1);
      first = lowerBound(window.ascending, Math.min(end0, end1) - margin);
      last = lowerBound(window.ascending, Math.max(end0, end1) + margin);
    }
    for (let position = first; position < last; position++) {
      const l = candidateLines[position];
      const x = x0 + slope * (gValues[l] - g0);
      if (x < from || x > to) continue;
      const k = nearestUsable(x);
      const p = usableByX[k];
      const quality = lineRankOf[l];
      if (Math.abs(usableX[k] - x) <= scoreTolerance && takenStamp[p] !== stamp) {
        takenStamp[p] = stamp;
        score +=
          landingCloseness(usableX[k] - x, toleranceX) *
          (1 + (1 - Math.abs(quality - peakRankOf[p])));
        count++;
        pairs?.push(toLampPair(input, p, l));
      } else if (quality >= 0.6) {
        score -= 0.5;
      }
    }
    return { score, count };
  }

  const grown: GrownPairing[] = [];
  const seen = new Set<string>();
  const keyOf = (pairs: readonly LampPair[]) =>
    pairs.map((p) => `${p.peakIndex}:${p.lineIndex}`).join();
  let attempts = 0;
  for (const hypothesis of bestFirst(hypotheses)) {
    if (attempts >= maxGrown) break;
    const seedPairs: LampPair[] = [];
    const { shape, anchorPeak, anchorLine, slope, separation } = hypothesis;
    scoreLocal(shape, anchorPeak, anchorLine, slope, separation, seedPairs);
    const key = `${hypothesis.shape}/${keyOf(seedPairs)}`;
    if (seen.has(key)) continue;
    seen.add(key);
    // A seed whose pairs a grown pairing already holds would grow into it again.
    if (
      grown.some(
        (g) =>
          g.shape === hypothesis.shape &&
          seedPairs.every((p) =>
            g.pairs.some((q) => q.peakIndex === p.peakIndex && q.lineIndex === p.lineIndex),
          ),
      )
    )
      continue;
    attempts++;
    const g = shapes[hypothesis.shape];
    const growInput: GrowPairsOutwardInput = {
      peaks,
      lines,
      candidateLines,
      usablePeaks: usable,
      dispersion,
      domain,
      toleranceX,
      straighten: g,
      gRange: [g(nominalRangeNm[0]), g(nominalRangeNm[1])],
      nominalRangeNm,
    };
    const pairs = growPairsOutward(growInput, seedPairs);
    grown.push(judgeGrown(growInput, pairs, hypothesis.shape));
  }
  grown.sort((a, b) => b.score - a.score);
  const best = grown[0] ?? null;
  if (!best) return { best: null, rival: null };
  const bestKeys = new Set(best.pairs.map((p) => `${p.peakIndex}:${p.lineIndex}`));
  const rival =
    grown.find(
      (g) =>
        g !== best &&
        g.pairs.filter((p) => bestKeys.has(`${p.peakIndex}:${p.lineIndex}`)).length <
          0.5 * Math.min(g.pairs.length, best.pairs.length),
    ) ?? null;
  return { best, rival };

  function judgeGrown(
    growInput: GrowPairsOutwardInput,
    pairs: LampPair[],
    shape: number,
  ): GrownPairing {
    const xs = pairs.map((p) => p.x);
    const covered: [number, number] = [Math.min(...xs), Math.max(...xs)];
    const coveredFraction = (covered[1] - covered[0]) / spanX;
    const degree = Math.max(1, growthDegree(pairs.length, coveredFraction, dispersion));
    const model = fitStraightenedPolynomial(pairs, growInput.straighten, growInput.gRange, degree);
    if (!model) return { pairs, shape, score: -Infinity, missingStrong: 0, coveredFraction };
    const paired = new Set(pairs.map((p) => p.lineIndex));
    // The stronger half of each gas's lines that fall inside the paired stretch should show a peak.
    const byElement = new Map<string, number[]>();
    for (const l of candidateLines) {
      const x = model.predictX(lines[l].wavelengthNm);
      if (!(x >= covered[0] && x <= covered[1])) continue;
      const element = elementOfSpecies(lines[l].species);
      byElement.set(element, [...(byElement.get(element) ?? []), l]);
    }
    let missingStrong = 0;
    for (const group of byElement.values()) {
      const strong = group
        .sort((a, b) => lines[b].intensity - lines[a].intensity)
        .slice(0, Math.ceil(group.length / 2));
      for (const l of strong) {
        if (paired.has(l)) continue;
        const x = model.predictX(lines[l].wavelengthNm);
        if (Math.abs(usableX[nearestUsable(x)] - x) > EXPECTED_PEAK_REACH * toleranceX)
          missingStrong++;
      }
    }
    // Right pairs sit within a tenth of a pixel or so of a smooth curve; chance coincidences, which a
    // bending model can collect too, scatter over the whole window. Each pair counts by how close it sits.
    const closeness = pairs.reduce(
      (sum, p) => sum + landingCloseness(p.x - model.predictX(p.wavelengthNm), toleranceX),
      0,
    );
    return { pairs, shape, score: closeness - 0.5 * missingStrong, missingStrong, coveredFraction };
  }
}
