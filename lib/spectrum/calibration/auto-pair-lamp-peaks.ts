// Automatic pairing of lamp peaks with known lamp lines, knowing only the instrument's nominal range
// and kind of dispersion: RANSAC over (peak, peak) × (line, line) draws, then iterative refinement.
//
// Each draw fixes a first guess x = A + B·g(λ), where g straightens the expected dispersion: g(λ) = λ
// for a grating, g(λ) = 1/(λ − λ₀) for a prism (a Hartmann shape with α = 1 whose λ₀ comes from real
// glasses, so blue lines are spread several times wider than red ones). The order of the line pair
// decides the direction of the axis, so both directions are tried. A guess must map the array onto the
// nominal range within a tolerance; it is scored by the lines that land on a peak, weighted by how well
// line intensity and peak height ranks agree, less a penalty for strong lines that land on no peak.
import type { CalibrationModel } from "./calibration-model";
import { hypothesisShapes, pairingContext } from "./lamp-pairing-setup";
import { pairsFromPrevious } from "./pairs-from-previous";
import { inverseOfModel } from "./inverse-of-model";
import { modelEvaluation } from "./model-evaluation";
import { recalibrateFromPrevious } from "./recalibrate-from-previous";
import { typicalPeakFwhm } from "./typical-peak-fwhm";
import { CalibrationError } from "./calibration-error";
import { claimFromSecondPairs } from "./claim-from-second-pairs";
import { withBlendUncertainty, withCentreFloor } from "./centre-uncertainty";
import type {
  LampLine,
  LampPair,
  LampPairingOptions,
  LampPairingResult,
  LampPeak,
} from "./lamp-pairing-types";
import {
  finishGrownPairing,
  finishLampPairing,
  refineLampPairing,
  refineLampPairs,
  type RefinedPairing,
} from "./refine-lamp-pairing";
import type { PairingContext } from "./pairing-context";
import { groupBlendedLampLines, type LampLineGroup } from "./group-blended-lamp-lines";
import { growthDegree } from "./growth-degree";
import { prunePulledPairs } from "./prune-pulled-pairs";
import {
  searchLampPairing,
  type GrownPairing,
  type SearchLampPairingOptions,
} from "./search-lamp-pairing";
import { fitStraightenedPolynomial } from "./straightened-polynomial";
import { makeRandom } from "../statistics/make-random";
import { MIN_TRUSTED_PAIRS } from "./min-trusted-pairs";
import { percentileRanks } from "./percentile-ranks";
import { lowerBound } from "../matching/lower-bound";
import { toLampPair } from "./to-lamp-pair";

export interface AutoPairLampPeaksOptions extends LampPairingOptions {
  /**
   * Seed of the random draws; the same seed gives the same result.
   * @default 1
   */
  seed?: number;
  /**
   * Number of RANSAC draws.
   * @default 20000
   */
  iterations?: number;
  /**
   * How far the guess may map the array's ends from the nominal range's ends, as a fraction of the span.
   * @default 0.25
   */
  rangeTolerance?: number;
  /**
   * "dispersion": first guesses follow the dispersion kind; "linear": always a straight line in λ (only
   * for diagnosis — it fails on prisms, which is the point of the prism shape).
   * @default "dispersion"
   */
  firstGuess?: "dispersion" | "linear";
  /**
   * How many of the best distinct first guesses are refined; the most confident result wins.
   * @default 4
   */
  refineCount?: number;
  /**
   * The instrument's previous calibration: a recalibration starts from it (a small shift and stretch)
   * and falls back to the blind search only when that pairing is not trusted.
   */
  previous?: CalibrationModel;
  /**
   * Scoring window of a first guess, in multiples of the matching tolerance (half the resolution).
   * @default 2
   */
  guessToleranceFactor?: number;
  /**
   * The blind search: "grow" (short-baseline anchors grown outward with a bending model) or "ransac"
   * (whole-array draws in the straightened axis, refined and, for a prism, grown with the glass
   * ensemble). Measured on the realistic-lamp sweep, growth pairs gratings twice as often at the same
   * or a lower rate of silent errors; on prisms it succeeds more often but was silently wrong more
   * often too (blends crowd a prism's red end), so prisms start with the draws. When the first search
   * trusts nothing and no search was asked for, the other gives a second opinion (`secondOpinion`):
   * trusted only where the first's candidate covers and agrees with it, or, when the first found
   * nothing, where it stands on nine pairs; else offered to check. Growth for a prism: on the blind
   * sweep (1500 instruments, seeds 1000 and 9500000–9900000) prisms went from 150 to 176 successes
   * with the same 10 silent wrongs overall; their CPU median from 133 to 214 ms, p99 from 0.9 to
   * 1.1 s. The draws for a grating: over 1,500 blind instruments (prisms of seeds 12100000 and
   * 12200000, the CLI's mix of 12400000 and 1000, 2048-pixel arrays of 1000) successes 912 → 924
   * with the same 16 silent wrongs and prisms unchanged; the gratings' CPU median and p99 within
   * the noise (62 and 375 ms against 67 and 350).
   * @default "grow" for a grating, "ransac" for a prism
   */
  search?: "grow" | "ransac";
}

/**
 * The instrument's FWHM in nm at a wavelength, from the nominal axis: two matching tolerances in x
 * through the local dispersion of the straightened nominal map (constant for a grating; several
 * times finer in the blue than in the red for a prism).
 */
function fwhmNmOfNominalAxis(
  context: PairingContext,
  straighten: (lambda: number) => number,
): (lambda: number) => number {
  const [low, high] = context.nominalRangeNm;
  const gSpan = Math.abs(straighten(high) - straighten(low));
  const spanX = context.domain[1] - context.domain[0];
  return (lambda) => {
    const step = 1e-3 * (high - low);
    const slope = Math.abs(straighten(lambda + step) - straighten(lambda - step)) / (2 * step);
    return (2 * context.toleranceX * gSpan) / (spanX * slope);
  };
}

/**
 * A blend's pair carries its top's uncertainty (table intensities are rough) on top of the peak's
 * own, through the local dispersion, so the fit weighs it for what it is.
 */
function withBlendTopUncertainty(
  pairs: LampPair[],
  groups: LampLineGroup[],
  context: PairingContext,
): LampPair[] {
  if (!pairs.some((p) => groups[p.lineIndex].wavelengthSigmaNm > 0)) return pairs;
  const g = context.straighten;
  const xs = pairs.map((p) => p.x);
  const coveredFraction =
    (Math.max(...xs) - Math.min(...xs)) / (context.domain[1] - context.domain[0]);
  const degree = Math.max(1, growthDegree(pairs.length, coveredFraction, context.dispersion));
  const model = fitStraightenedPolynomial(
    pairs,
    g,
    [g(context.nominalRangeNm[0]), g(context.nominalRangeNm[1])],
    degree,
  );
  if (!model) return pairs;
  return pairs.map((p) => {
    const sigmaNm = groups[p.lineIndex].wavelengthSigmaNm;
    if (!(sigmaNm > 0)) return p;
    const step = 0.01;
    const pixelsPerNm =
      Math.abs(model.predictX(p.wavelengthNm + step) - model.predictX(p.wavelengthNm - step)) /
      (2 * step);
    return { ...p, xUncertainty: Math.hypot(p.xUncertainty ?? 0, sigmaNm * pixelsPerNm) };
  });
}

/** A result about grouped lines, told in the caller's lines: a blend's pair points at its strongest line. */
function inCallerLines(
  result: LampPairingResult,
  groups: LampLineGroup[],
  lines: LampLine[],
  candidateLines: number[],
): LampPairingResult {
  const indexOf = new Map(lines.map((l, i) => [l.id, i]));
  const toCaller = (pairs: LampPair[]) =>
    pairs.map((p) => ({
      ...p,
      lineIndex: indexOf.get(groups[p.lineIndex]?.id ?? p.lineId ?? "") ?? p.lineIndex,
    }));
  const pairedMembers = new Set(result.pairs.flatMap((p) => groups[p.lineIndex]?.members ?? []));
  return {
    ...result,
    pairs: toCaller(result.pairs),
    suggestion: toCaller(result.suggestion),
    ...(result.rivalSuggestion ? { rivalSuggestion: toCaller(result.rivalSuggestion) } : {}),
    unmatchedLines: candidateLines.filter((i) => !pairedMembers.has(i)).map((i) => lines[i]),
  };
}

/** A rival within this many points of the best grown pairing's score makes the choice between them a person's. */
const RIVAL_MARGIN = 2;

/**
 * A "paired" result whose grown pairing has a rival that explains the spectrum nearly as well becomes
 * "check": the two disagree, and nothing in the spectrum decides between them.
 */
function withRival(
  result: LampPairingResult,
  best: GrownPairing,
  rival: GrownPairing | null,
): LampPairingResult {
  if (!rival || result.status !== "paired") return result;
  const margin = Math.max(RIVAL_MARGIN, 0.15 * best.score);
  if (rival.score < best.score - margin) return result;
  const reason =
    `another pairing of the peaks explains the spectrum nearly as well (${rival.pairs.length} pairs against ${best.pairs.length}); ` +
    `compare the two and confirm one`;
  return {
    ...result,
    status: "check",
    checks: [
      ...(result.checks ?? []),
      {
        name: "rival-pairing",
        passed: false,
        value: rival.score / Math.max(best.score, 1),
        reason,
      },
    ],
    reasons: [...(result.reasons ?? []), reason],
    candidate: result.model,
    confidence: Math.min(result.confidence, 0.49),
    pairs: [],
    model: null,
    rivalSuggestion: rival.pairs,
    message: `check this pairing: ${reason}`,
  };
}

/**
 * Draws from `pool` with weight 1/(rank + 3): strong items more often, weak ones still possible. The
 * weights are worked out once per pool, not on each of the draws' 80,000 picks.
 */
function weightedPicker(pool: readonly number[], random: () => number): () => number {
  const weights = pool.map((_, rank) => 1 / (rank + 3));
  const total = weights.reduce((s, w) => s + w, 0);
  return () => {
    let u = random() * total;
    for (let k = 0; k < pool.length; k++) {
      u -= weights[k];
      if (u <= 0) return pool[k];
    }
    return pool[pool.length - 1];
  };
}

interface Hypothesis {
  a: number;
  b: number;
  shape: number;
  score: number;
  matched: LampPair[];
}

/**
 * Pairs `peaks` with `lines` automatically; falls back to "needs-manual" when the result is not trusted.
 * With the instrument's previous calibration the pairing starts from it (a recalibration) and searches
 * blind only when that fails.
 */
export function autoPairLampPeaks(
  peaks: LampPeak[],
  lines: LampLine[],
  options: AutoPairLampPeaksOptions,
): LampPairingResult {
  if (!options.previous) return claimFromSecondPairs(blindLampPairing(peaks, lines, options));
  const context = pairingContext(peaks, lines, options);
  let recalibrated: LampPairingResult | null = null;
  try {
    recalibrated = recalibration(context, options.previous);
  } catch (error) {
    // A stored calibration that cannot be evaluated (an invalid model) is no starting point.
    if (!(error instanceof CalibrationError)) throw error;
  }
  if (recalibrated?.status === "paired") return recalibrated;
  // Yesterday's model fitted its own lines too loosely to carry today's, though the drift's pairs passed
  // every other check: the lines are known, only the shape is doubted, so today's pairs get a fit of
  // their own (checked as a blind pairing is).
  const failed = (recalibrated?.checks ?? []).filter((c) => !c.passed);
  const onlyShapeDoubted = failed.length > 0 && failed.every((c) => c.name === "previous-fit");
  if (!recalibrated || onlyShapeDoubted) {
    const refitted = refitFromPrevious(context, options.previous, onlyShapeDoubted);
    if (refitted) return claimFromSecondPairs(refitted);
    if (!recalibrated) return claimFromSecondPairs(blindLampPairing(peaks, lines, options));
  }
  // A recalibration to check stands unless a blind search, which knows nothing of yesterday, finds the
  // same axis: two independent routes to one answer are trusted, a disagreement is the person's call.
  const blind = blindLampPairing(peaks, lines, options);
  if (blind.status === "paired" && blind.model && recalibrated.candidate) {
    if (modelsAgree(blind.model.model, recalibrated.candidate.model, context))
      return claimFromSecondPairs(blind);
  }
  return recalibrated;
}

/**
 * Today's pairs as `previous` predicts them, fitted afresh: in `previous`'s family (the drift does not
 * explain today's lamp, the instrument was realigned, say), then, with `anyModel`, free to choose its
 * model (a prism of another glass, Hartmann, a polynomial) when that family fails. Null unless trusted.
 */
function refitFromPrevious(
  context: PairingContext,
  previous: CalibrationModel,
  anyModel: boolean,
): LampPairingResult | null {
  const seeded = pairsFromPrevious(context, previous);
  if (seeded.length < 4) return null;
  const start = { pairs: seeded, rmsX: Infinity, score: seeded.length };
  const inFamily = finishLampPairing({ ...context, previousModel: previous }, start);
  if (inFamily.status === "paired") return inFamily;
  if (!anyModel) return null;
  const free = finishLampPairing(context, start);
  return free.status === "paired" ? free : null;
}

/** Whether two calibrations agree within a tenth of a matching tolerance wherever both are covered. */
function modelsAgree(a: CalibrationModel, b: CalibrationModel, context: PairingContext): boolean {
  const low = Math.max(a.coveredX[0], b.coveredX[0]);
  const high = Math.min(a.coveredX[1], b.coveredX[1]);
  if (!(high > low)) return false;
  const xs = Array.from({ length: 41 }, (_, i) => low + ((high - low) * i) / 40);
  const first = modelEvaluation(a, xs);
  const second = modelEvaluation(b, xs);
  return xs.every((_, i) => {
    const toleranceNm = context.toleranceX * Math.abs(first.dispersion[i]);
    return Math.abs(first.wavelengthNm[i] - second.wavelengthNm[i]) <= 0.2 * toleranceNm;
  });
}

/**
 * The recalibration from `previous`, with lines that blend at today's resolution paired as one line at
 * the top of their peak (as the blind search does), reported in the caller's lines.
 */
function recalibration(
  context: PairingContext,
  previous: CalibrationModel,
): LampPairingResult | null {
  let xOf: (lambda: number) => number;
  try {
    xOf = inverseOfModel(previous, previous.domain);
  } catch {
    return null;
  }
  const fwhmX = typicalPeakFwhm(context.peaks);
  if (fwhmX === undefined) return null;
  const [xMin, xMax] = previous.domain;
  const ends = modelEvaluation(previous, [xMin, xMax]).wavelengthNm;
  const meanNmPerX = Math.abs(ends[1] - ends[0]) / (xMax - xMin);
  const fwhmNmAt = (lambda: number) => {
    const u = xOf(lambda);
    const nmPerX = Number.isFinite(u)
      ? Math.abs(modelEvaluation(previous, [u]).dispersion[0])
      : Number.NaN;
    return fwhmX * (Number.isFinite(nmPerX) && nmPerX > 0 ? nmPerX : meanNmPerX);
  };
  const groups = groupBlendedLampLines(context.lines, context.candidateLines, fwhmNmAt);
  const grouped: PairingContext = {
    ...context,
    peaks: withBlendUncertainty(context.peaks),
    lines: groups,
    candidateLines: groups.map((_, i) => i),
  };
  const result = recalibrateFromPrevious(grouped, previous, { previousInverse: xOf });
  return result && inCallerLines(result, groups, context.lines, context.candidateLines);
}

/**
 * A prism's second search anchors on its 15 strongest peaks and 22 strongest lines (a grating's search
 * takes 30 and 45): a dense prism lamp made millions of short-baseline hypotheses. On the blind sweep
 * (1500 instruments) this gave the same outcome counts as 20 and 30 (20 instruments changed, both
 * ways) and 2 successes more than 30 and 45, and the prisms' CPU p90 fell from 820 (30 and 45) to
 * 544 ms.
 */
const PRISM_SECOND_SEARCH: SearchLampPairingOptions = { anchorPeaks: 15, anchorLines: 22 };

/** The blind search: nothing but the nominal range and the kind of dispersion is known. */
function blindLampPairing(
  peaks: LampPeak[],
  lines: LampLine[],
  options: AutoPairLampPeaksOptions,
): LampPairingResult {
  const search = options.search ?? (options.dispersion === "prism" ? "ransac" : "grow");
  const setup = pairingContext(peaks, lines, options);
  const shapes = hypothesisShapes(
    options.firstGuess === "linear" ? "linear" : setup.dispersion,
    options.nominalRangeNm,
  );
  if (search === "grow") {
    const grown = grownLampPairing(peaks, lines, setup, shapes);
    if (grown.status === "paired" || options.search !== undefined) return grown;
    return secondOpinion(
      grown,
      drawnLampPairing(peaks, lines, flooredCentres(setup), shapes, options),
      setup,
      ONLY_THE_DRAWS,
    );
  }
  // The draws, and growth as a prism's second opinion to them, weigh centres by the floor alone.
  const floored = flooredCentres(setup);
  const drawn = drawnLampPairing(peaks, lines, floored, shapes, options);
  if (drawn.status === "paired" || options.search !== undefined || setup.dispersion !== "prism")
    return drawn;
  return secondOpinion(
    drawn,
    grownLampPairing(peaks, lines, floored, prismGrowthShapes(shapes), PRISM_SECOND_SEARCH),
    floored,
    ONLY_GROWTH,
  );
}

/** `setup` with each peak's centre weighed by the floor alone (see withCentreFloor). */
function flooredCentres(setup: PairingContext): PairingContext {
  return { ...setup, peaks: withCentreFloor(setup.peaks) };
}

/**
 * The whole-array draws: (peak, peak) × (line, line) first guesses straight in each shape's axis,
 * scored by the lines they land on a peak, the best few refined and the most confident finished.
 * `context`'s peaks carry the centre floor alone (flooredCentres).
 */
function drawnLampPairing(
  peaks: LampPeak[],
  lines: LampLine[],
  context: PairingContext,
  shapes: ((lambda: number) => number)[],
  options: AutoPairLampPeaksOptions,
): LampPairingResult {
  const { seed = 1, iterations = 20000, rangeTolerance = 0.25, refineCount = 4 } = options;
  // Uniform draws from the seed, so automatic pairing gives the same answer for the same seed; a seed
  // whose low 32 bits are zero stands for 0x9e3779b9.
  const random = makeRandom(seed >>> 0 || 0x9e3779b9).uniform;
  const [nominalLow, nominalHigh] = options.nominalRangeNm;
  const [xMin, xMax] = context.domain;
  const domainSpan = xMax - xMin;
  const candidates = context.candidateLines;
  if (peaks.length < 4 || candidates.length < 4) {
    return refineLampPairing(context, []);
  }
  const peakRank = percentileRanks(peaks.map((p) => p.height));
  // Lines are handled by their position in `candidates`: the scoring loop visits every candidate per draw.
  const rankByCandidate = percentileRanks(candidates.map((l) => lines[l].intensity));
  const strongPeaks = peaks
    .map((_, i) => i)
    .sort((a, b) => peaks[b].height - peaks[a].height)
    .slice(0, 20);
  const strongLines = candidates
    .map((_, c) => c)
    .sort((a, b) => lines[candidates[b]].intensity - lines[candidates[a]].intensity)
    .slice(0, 30);
  const pickPeak = weightedPicker(strongPeaks, random);
  const pickLine = weightedPicker(strongLines, random);
  const peaksByX = peaks.map((_, i) => i).sort((a, b) => peaks[a].x - peaks[b].x);
  const sortedX = peaksByX.map((i) => peaks[i].x);
  const gByCandidate = shapes.map((g) => candidates.map((l) => g(lines[l].wavelengthNm)));
  const gEnds = shapes.map((g) => [g(nominalLow), g(nominalHigh)]);

  const nearestPeak = (x: number): number => {
    const low = lowerBound(sortedX, x);
    if (low === 0) return peaksByX[0];
    if (low === sortedX.length) return peaksByX[sortedX.length - 1];
    return x - sortedX[low - 1] < sortedX[low] - x ? peaksByX[low - 1] : peaksByX[low];
  };

  // Scoring is tight (a wide window collects chance coincidences as fast as true lines); a crude guess
  // still scores well near its two anchors, and the refinement then grows it.
  const guessTolerance = (options.guessToleranceFactor ?? 2) * context.toleranceX;
  const scoreHypothesis = (a: number, b: number, shape: number, keep: boolean): Hypothesis => {
    let score = 0;
    const matched: LampPair[] = [];
    const used = new Set<number>();
    const g = gByCandidate[shape];
    for (let c = 0; c < candidates.length; c++) {
      const l = candidates[c];
      const x = a + b * g[c];
      if (x < xMin || x > xMax) continue;
      const p = nearestPeak(x);
      const quality = rankByCandidate[c];
      if (Math.abs(peaks[p].x - x) <= guessTolerance && !used.has(p)) {
        used.add(p);
        score += 1 + (1 - Math.abs(quality - peakRank[p]));
        if (keep) matched.push(toLampPair({ peaks, lines }, p, l));
      } else if (quality >= 0.75) {
        score -= 0.5;
      }
    }
    return { a, b, shape, score, matched };
  };

  const best: Hypothesis[] = [];
  for (let iteration = 0; iteration < iterations; iteration++) {
    const shape = iteration % shapes.length;
    const p1 = pickPeak();
    const p2 = pickPeak();
    const c1 = pickLine();
    const c2 = pickLine();
    if (p1 === p2 || c1 === c2) continue;
    const g1 = gByCandidate[shape][c1];
    const g2 = gByCandidate[shape][c2];
    const b = (peaks[p2].x - peaks[p1].x) / (g2 - g1);
    const a = peaks[p1].x - b * g1;
    if (!Number.isFinite(b) || b === 0) continue;
    // Where the nominal range's ends would land; they must sit near the array's ends, either way round.
    const xLow = a + b * gEnds[shape][0];
    const xHigh = a + b * gEnds[shape][1];
    const forward = Math.abs(xLow - xMin) + Math.abs(xHigh - xMax);
    const reverse = Math.abs(xLow - xMax) + Math.abs(xHigh - xMin);
    if (Math.min(forward, reverse) > 2 * rangeTolerance * domainSpan) continue;
    const hypothesis = scoreHypothesis(a, b, shape, false);
    // Keep the best few that differ: two guesses that put the array's ends within a tolerance are one.
    const duplicate = best.findIndex(
      (h) =>
        h.shape === shape &&
        Math.abs(h.a + h.b * gEnds[shape][0] - xLow) < 4 * guessTolerance &&
        Math.abs(h.a + h.b * gEnds[shape][1] - xHigh) < 4 * guessTolerance,
    );
    if (duplicate >= 0) {
      if (best[duplicate].score < hypothesis.score) best[duplicate] = hypothesis;
    } else {
      best.push(hypothesis);
    }
    best.sort((x, y) => y.score - x.score);
    if (best.length > refineCount) best.length = refineCount;
  }

  let chosen: { context: PairingContext; refined: RefinedPairing } | undefined;
  for (const h of best) {
    const { matched } = scoreHypothesis(h.a, h.b, h.shape, true);
    const shaped: PairingContext = { ...context, straighten: shapes[h.shape] };
    const refined = refineLampPairs(shaped, matched);
    if (!chosen || refined.score > chosen.refined.score) chosen = { context: shaped, refined };
  }
  return chosen
    ? finishLampPairing(chosen.context, chosen.refined)
    : refineLampPairing(context, []);
}

/**
 * Growth from short-baseline anchors (`searchLampPairing`), fitted and checked. Pairing sees the lamp
 * as the spectrometer does: lines that blend are one line at the top of their peak.
 */
function grownLampPairing(
  peaks: LampPeak[],
  lines: LampLine[],
  context: PairingContext,
  shapes: ((lambda: number) => number)[],
  searchOptions: SearchLampPairingOptions = {},
): LampPairingResult {
  const groups = groupBlendedLampLines(
    lines,
    context.candidateLines,
    fwhmNmOfNominalAxis(context, shapes[0]),
  );
  const grouped: PairingContext = {
    ...context,
    peaks: withBlendUncertainty(peaks),
    lines: groups,
    candidateLines: groups.map((_, i) => i),
  };
  const search = searchLampPairing({ ...grouped, shapes }, searchOptions);
  if (!search.best)
    return inCallerLines(refineLampPairing(context, []), groups, lines, context.candidateLines);
  const shaped: PairingContext = { ...grouped, straighten: shapes[search.best.shape] };
  const g = shapes[search.best.shape];
  const centred = prunePulledPairs(
    search.best.pairs,
    g,
    [g(context.nominalRangeNm[0]), g(context.nominalRangeNm[1])],
    context.dispersion,
    context.domain,
  );
  const result = finishGrownPairing(shaped, withBlendTopUncertainty(centred, groups, shaped));
  return inCallerLines(
    withRival(result, search.best, search.rival),
    groups,
    lines,
    context.candidateLines,
  );
}

/** Straightening axes a prism's second search grows in: the crown, the middle and the densest glass. */
function prismGrowthShapes(shapes: ((lambda: number) => number)[]): ((lambda: number) => number)[] {
  if (shapes.length <= 3) return shapes;
  return [shapes[0], shapes[shapes.length >> 1], shapes[shapes.length - 1]];
}

/**
 * Whether `other` covers `model`'s whole covered range, ends included to within a FWHM (two matching
 * tolerances), so that agreeing there confirms it: an end pair beyond the other's range is where a wrong
 * pairing shows (a flint's crowded red end once paired 0.8 nm off, one pair beyond the draws' range).
 */
function coversEnds(other: CalibrationModel, model: CalibrationModel, toleranceX: number): boolean {
  return (
    other.coveredX[0] <= model.coveredX[0] + 2 * toleranceX &&
    other.coveredX[1] >= model.coveredX[1] - 2 * toleranceX
  );
}

/**
 * Pairs a second opinion needs to be trusted when the first search found no candidate to compare it
 * with (a prism's growth, a grating's draws): half again the minimum, since one route stands alone. A
 * grating's draws standing alone on nine pairs or more were right 5 of 5 times over 1,500 blind
 * instruments (seeds 12100000, 12200000, 12400000, 1000 and 1000 at 2048 pixels). A prism's growth,
 * over 2,200 blind instruments of eight seeds (1000, 2000, 9500000, 9600000, 9800000, 9900000,
 * 10600000, 10700000): growth-only pairings with at least nine pairs were right 27 of 27 times (with
 * fewer, 8 of 9: the one wrong, an N-SF6 prism of 8 pairs, missed by 1.5 tolerances); on fresh prism
 * seeds 10800000 and 10900000 (n 300 each) 12 of 12.
 */
const SINGLE_ROUTE_PAIRS = Math.ceil(1.5 * MIN_TRUSTED_PAIRS);

/** Why a second opinion found alone is offered to check, by which route found it. */
const ONLY_GROWTH =
  "only the search that grows pairs outward found this pairing (the whole-array draws found none to confirm it)";
const ONLY_THE_DRAWS =
  "only the whole-array draws found this pairing (the search that grows pairs outward found none to confirm it)";

/**
 * The first search trusted nothing; the other route is the second opinion (a prism's draws, then
 * growth; a grating's growth, then the draws). The second route's pairing is "paired" where the first
 * route's own untrusted candidate agrees with it and covers its range, two independent routes to one
 * axis, or, when the first found no candidate at all, where the second stands on at least
 * SINGLE_ROUTE_PAIRS pairs; otherwise it is offered for a person to check (`aloneReason` says why),
 * beside the first route's candidate.
 */
function secondOpinion(
  first: LampPairingResult,
  second: LampPairingResult,
  context: PairingContext,
  aloneReason: string,
): LampPairingResult {
  const secondModel = second.model ?? second.candidate ?? null;
  if (!secondModel) return first;
  const firstModel = first.candidate ?? null;
  if (firstModel) {
    const agree = modelsAgree(secondModel.model, firstModel.model, context);
    if (
      agree &&
      second.status === "paired" &&
      coversEnds(firstModel.model, secondModel.model, context.toleranceX)
    )
      return second;
    // Two different axes: the first route's stays the one to check, the second's is its rival.
    if (agree || first.rivalSuggestion) return first;
    const secondPairs = second.status === "paired" ? second.pairs : second.suggestion;
    return { ...first, rivalSuggestion: secondPairs };
  }
  // The first route found nothing: the second's pairing stands on its own pairs when they are many,
  // else it is offered to be checked.
  if (second.status !== "paired" || second.pairs.length >= SINGLE_ROUTE_PAIRS) return second;
  return {
    ...second,
    status: "check",
    checks: [
      ...(second.checks ?? []),
      { name: "second-search", passed: false, value: 0, reason: aloneReason },
    ],
    reasons: [aloneReason],
    candidate: second.model,
    confidence: Math.min(second.confidence, 0.49),
    pairs: [],
    model: null,
    suggestion: second.pairs,
    message: `check this pairing: ${aloneReason}`,
  };
}
