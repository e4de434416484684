// Recalibration: the daily case. The instrument's previous calibration already knows the shape of its
// dispersion; overnight only the array's position and the image scale move a little (temperature, a
// knock). So today's axis is yesterday's model moved by a linear drift x = stretch·u + offset, and the
// only question is the drift: two numbers, which a handful of lamp lines pin down wherever they stand.
// The drift that puts the most (and strongest) lamp lines on peaks is searched over a grid, refined by
// least squares with the pairs that stray set aside, and trusted only when the lamp lines sit on it
// tightly, no other drift explains the peaks nearly as well, the drift is known well at both ends of
// the array, and most strong lamp lines found their peak. A drift that bends (the instrument was
// realigned) is not a drift: the caller then fits a fresh model.
import type { CalibrationModel } from "./calibration-model";
import { driftedModel, type LinearDrift } from "./drifted-model";
import type { FitCalibrationResult } from "./fit-calibration";
import { lowerBound } from "../matching/lower-bound";
import { inverseOfModel } from "./inverse-of-model";
import type { LampPair, LampPairingResult } from "./lamp-pairing-types";
import { modelEvaluation } from "./model-evaluation";
import type { PairingContext } from "./pairing-context";
import { toLampPair } from "./to-lamp-pair";
import { typicalPeakFwhm } from "./typical-peak-fwhm";
import type { PairingCheck } from "./lamp-pairing-types";
import { weightedLeastSquares } from "./weighted-least-squares";
import { upperMedian } from "../statistics/upper-median";

export interface RecalibrateFromPreviousOptions {
  /** Largest shift searched, as a fraction of the array. @default 0.03 */
  maxShiftFraction?: number;
  /** Largest relative stretch searched. @default 0.01 */
  maxStretch?: number;
  /**
   * x(λ) of `previous` on its domain, when the caller has already made it (inverting a model on a dense
   * grid is the costliest step of the setup). @default inverseOfModel(previous, previous.domain)
   */
  previousInverse?: (lambda: number) => number;
}

/**
 * Limits of the recalibration's checks, in matching tolerances (half the peaks' median FWHM) where
 * they are distances; tuned on the re-recorded realistic-lamp sweep (`npm run sweep -- --previous`).
 */
export const RECALIBRATION_LIMITS = {
  /** Fewest lamp lines on the drift: two fix it, the rest test it. */
  minPairs: 4,
  /** Largest RMS of the pairs about the drift (true pairs sit far inside a tolerance, chance ones scatter over it). */
  maxScatter: 0.25,
  /** Largest score of any clearly different drift, as a share of the best one's. */
  maxRivalShare: 0.6,
  /**
   * Largest 1σ uncertainty of the drift inside the covered range, in tolerances (half a FWHM), so that
   * about three σ stay within a tenth of a FWHM, the accuracy a calibration is held to. Measured on the
   * re-recorded sweep (seeds 123456 and 223456, n 200 each): 0.1 gave 81.0 % success and 2 silent
   * wrongs of 200 on the first; 0.07 gave 79.3 % and 81.3 % with 1 of 200 each; 0.05, 69.6 % and 76.4 %.
   */
  maxDriftSigma: 0.07,
  /** The covered range of a day's drift reaches at most this share of the array beyond the outermost lines. */
  maxExtrapolationShare: 0.25,
  /**
   * A day's drift (temperature, a knock; common practice puts it at a few pixels and a few tenths of a
   * per cent of stretch) stretches the array by at most this much and moves its middle by at most this
   * share of it; a larger one is a realignment and is trusted only between its lines.
   */
  maxDailyStretch: 0.005,
  maxDailyShiftShare: 0.01,
  /**
   * Smallest share of the array the covered range must span to be trusted without a check (outside it,
   * runs are warned that they extrapolate; as the instrument's default it needs a reason below 60 %).
   * Measured on the re-recorded sweep (seeds 123456 and 423456, n 200): 0.3 gave 81.0 and 85.0 %
   * success, 0.2 gave 82.6 and 87.2 %, 0.1 gave 85.9 and 88.2 %, each with the same silent wrongs.
   */
  minCoveredShare: 0.2,
  /** Largest RMS of the previous calibration's own fit, in today's matching tolerances (nm). */
  maxPreviousRms: 0.05,
  /** Smallest share of the strongest lamp lines on the array that must have found their peak. */
  minExpectedShare: 0.5,
  /** Largest departure of a quadratic drift from the straight one anywhere on the array, when significant. */
  maxBend: 0.15,
};

/** The drift grid holds at most about this many hypotheses (it is coarsened beyond). */
const MAX_HYPOTHESES = 40_000;
/** Strongest lamp lines the expected-lines check asks about. */
const EXPECTED_STRONGEST = 10;

interface Predicted {
  line: number;
  /** Yesterday's pixel of the line. */
  u: number;
  weight: number;
  /** 1σ of a blend group's top, in x units (0 for a single line). */
  sigmaX: number;
}

interface DriftFit {
  pairs: LampPair[];
  /** Summed weight of the lines on the drift. */
  score: number;
  rejected: LampPair[];
  drift: LinearDrift;
  /** RMS of the kept pairs about the drift, x units (dof-corrected). */
  scatterX: number;
  /** Largest departure of a significant quadratic drift from the straight one, x units (0 when none). */
  bendX: number;
}

/** Index into sorted `xs` of the value nearest `x` (xs non-empty). */
function nearestIndex(xs: number[], x: number): number {
  const low = lowerBound(xs, x);
  if (low === 0) return 0;
  if (low === xs.length) return xs.length - 1;
  return x - xs[low - 1] <= xs[low] - x ? low - 1 : low;
}

/** Peaks wider than this many typical line widths take no lamp line (as a sample's "broad" peaks). */
const BROAD_PEAK_FWHMS = 3;

/**
 * Today's calibration from `previous` and today's lamp peaks, or null when the previous calibration
 * cannot be moved onto today's array (another array length, a bent drift, too few lines). A result
 * is "paired" only when every check passes; otherwise "check", with the reasons and the candidate.
 * `context.lines` may be blend groups (a `wavelengthSigmaNm` is then added to their pairs' σ).
 */
export function recalibrateFromPrevious(
  context: PairingContext,
  previous: CalibrationModel,
  options: RecalibrateFromPreviousOptions = {},
): LampPairingResult | null {
  const { maxShiftFraction = 0.03, maxStretch = 0.01 } = options;
  const { peaks, lines, candidateLines } = context;
  const [xMin, xMax] = context.domain;
  const span = xMax - xMin;
  const middle = 0.5 * (xMin + xMax);
  const previousSpan = previous.domain[1] - previous.domain[0];
  if (peaks.length < 2 || Math.abs(previousSpan - span) > maxShiftFraction * span) return null;

  let xOf: (lambda: number) => number;
  try {
    xOf = options.previousInverse ?? inverseOfModel(previous, previous.domain);
  } catch {
    return null;
  }
  // The matching tolerance is half the lines' own width on today's array, as measured.
  const fwhmX = typicalPeakFwhm(peaks) ?? 2 * context.toleranceX;
  const tolerance = 0.5 * fwhmX;
  // Strong lines count more: a chance coincidence with a faint line is cheap, with a strong one rare.
  const located = candidateLines
    .map((line) => ({
      line,
      u: xOf(lines[line].wavelengthNm),
      weight: 1 + Math.log1p(Math.max(lines[line].intensity, 0)),
    }))
    .filter((p) => Number.isFinite(p.u));
  const nmPerX = modelEvaluation(
    previous,
    located.map((p) => p.u),
  ).dispersion;
  const predicted: Predicted[] = located.map((p, i) => {
    const sigmaNm = (lines[p.line] as { wavelengthSigmaNm?: number }).wavelengthSigmaNm ?? 0;
    return { ...p, sigmaX: sigmaNm > 0 ? sigmaNm / Math.abs(nmPerX[i]) : 0 };
  });
  if (predicted.length < RECALIBRATION_LIMITS.minPairs) return null;

  // A peak several line widths wide is continuum structure or a clump of lines: no lamp line's place.
  const order = peaks
    .map((_, i) => i)
    .filter((i) => !((peaks[i].fwhm ?? 0) > BROAD_PEAK_FWHMS * fwhmX))
    .sort((a, b) => peaks[a].x - peaks[b].x);
  const sortedX = order.map((i) => peaks[i].x);

  // The grid: steps of half a tolerance in shift and in stretch at the array's ends, coarsened (with a
  // window to match) when the array is so many tolerances long that the grid would be huge.
  const maxShift = maxShiftFraction * span;
  let shiftStep = 0.5 * tolerance;
  let stretchStep = (0.5 * tolerance) / (0.5 * span);
  const count = () =>
    (2 * Math.ceil(maxShift / shiftStep) + 1) * (2 * Math.ceil(maxStretch / stretchStep) + 1);
  while (count() > MAX_HYPOTHESES) {
    shiftStep *= 1.25;
    stretchStep *= 1.25;
  }
  const window = Math.max(tolerance, shiftStep);
  // A hypothesis scores the lines it puts on a peak, each by its weight and how close it lands; with
  // `unlike`, only lines it puts on another peak than the best hypothesis does (a rival's own evidence).
  const scoreOf = (stretch: number, shift: number, unlike?: Int32Array): number => {
    let score = 0;
    predicted.forEach(({ u, weight }, i) => {
      const x = middle + (u - middle) * stretch + shift;
      if (x < xMin || x > xMax) return;
      const k = nearestIndex(sortedX, x);
      const distance = Math.abs(sortedX[k] - x);
      if (distance <= window && unlike?.[i] !== k) score += weight * (1 - (distance / window) ** 2);
    });
    return score;
  };
  const grid: { stretch: number; shift: number }[] = [];
  const shiftSteps = Math.ceil(maxShift / shiftStep);
  const stretchSteps = Math.ceil(maxStretch / stretchStep);
  for (let i = -stretchSteps; i <= stretchSteps; i++) {
    for (let j = -shiftSteps; j <= shiftSteps; j++)
      grid.push({ stretch: 1 + i * stretchStep, shift: j * shiftStep });
  }
  const scores = grid.map((h) => scoreOf(h.stretch, h.shift));
  const bestAt = scores.reduce((b, v, i) => (v > scores[b] ? i : b), 0);
  const best = { ...grid[bestAt], score: scores[bestAt] };
  if (!(best.score > 0)) return null;
  // The peak each line lands on under the best hypothesis (−1: none).
  const bestPeakOf = Int32Array.from(predicted, ({ u }) => {
    const x = middle + (u - middle) * best.stretch + best.shift;
    const k = nearestIndex(sortedX, x);
    return x >= xMin && x <= xMax && Math.abs(sortedX[k] - x) <= window ? k : -1;
  });
  // A rival moves some part of the array by more than two tolerances against the best, and is scored
  // only by the lines it pairs differently.
  type GridDrift = { stretch: number; shift: number };
  const farApart = (a: GridDrift, b: GridDrift) =>
    [xMin, xMax].some(
      (x) => Math.abs(a.shift - b.shift + (a.stretch - b.stretch) * (x - middle)) > 2 * tolerance,
    );
  const differs = (h: GridDrift) => farApart(h, best);
  // The strongest few distinct drifts against the best (each moves the array by more than two
  // tolerances against the best and against each other) are the coarse rivals.
  const rivalScores = grid.map((h) => (differs(h) ? scoreOf(h.stretch, h.shift, bestPeakOf) : 0));
  const coarseRivals: GridDrift[] = [];
  for (const at of rivalScores.map((_, i) => i).sort((a, b) => rivalScores[b] - rivalScores[a])) {
    if (coarseRivals.length >= COARSE_RIVALS || !(rivalScores[at] > 0)) break;
    if (coarseRivals.every((o) => farApart(grid[at], o))) coarseRivals.push(grid[at]);
  }

  const fitted = fitDrift(
    context,
    predicted,
    sortedX,
    order,
    tolerance,
    (u) => middle + (u - middle) * best.stretch + best.shift,
    maxStretch,
  );
  if (!fitted) return null;
  if (fitted.bendX > RECALIBRATION_LIMITS.maxBend * tolerance) return null;

  const { drift, pairs } = fitted;
  const model = driftedModel(previous, drift, context.domain);
  const covered = coveredByDrift(drift, previous, pairs, context.domain, tolerance);
  const fit = fitResult(model, drift, fitted, covered);

  // Checks.
  const todayX = (u: number) => drift.stretch * u + drift.offset;
  const coveredShare = Math.max(0, covered[1] - covered[0]) / span;
  const pairedLines = new Set(pairs.map((p) => p.lineIndex));
  const onArray = predicted
    .filter((p) => {
      const x = todayX(p.u);
      return x >= xMin + tolerance && x <= xMax - tolerance;
    })
    .sort((a, b) => lines[b.line].intensity - lines[a.line].intensity)
    .slice(0, EXPECTED_STRONGEST);
  const expectedShare =
    onArray.length > 0 ? onArray.filter((p) => pairedLines.has(p.line)).length / onArray.length : 0;
  const scatter = fitted.scatterX / tolerance;
  // A rival counts only the lines it puts tightly on other peaks, as the chosen drift's do.
  const chosen = new Set(pairs.map((p) => `${p.lineIndex}:${p.peakIndex}`));
  const chosenScore = fitted.score;
  const departs = (at: (u: number) => number) =>
    [xMin, xMax].some((x) => Math.abs(at((x - drift.offset) / drift.stretch) - x) > 2 * tolerance);
  let rival: { score: number; pairs: LampPair[] } = { score: 0, pairs: [] };
  for (const h of coarseRivals) {
    const near = candidatesNear(
      context,
      predicted,
      sortedX,
      order,
      tolerance,
      (u) => middle + (u - middle) * h.stretch + h.shift,
    ).filter((c) => !chosen.has(`${c.pair.lineIndex}:${c.pair.peakIndex}`));
    const found = consensus(near, tolerance, maxStretch, departs);
    if (found && found.score > rival.score) {
      rival = {
        score: found.score,
        pairs: onDrift(near, found.at, CONSENSUS_REACH * tolerance).map((c) => c.pair),
      };
    }
  }
  // Yesterday's own fit: its shape between and beyond today's lines is only as good as its RMS.
  const todayNmPerX = modelEvaluation(
    model,
    pairs.map((p) => p.x),
  ).dispersion.map(Math.abs);
  const toleranceNm = tolerance * upperMedian(Array.from(todayNmPerX));
  const previousFit = previous.rmsNm / toleranceNm;
  const rivalShare = rival.score / chosenScore;
  const limits = RECALIBRATION_LIMITS;
  const moved = `moved by ${signed(todayX(middle) - middle, 2)} x units at the middle`;
  const stretchWords = `stretched by ${signed(100 * (drift.stretch - 1), 3)} %`;
  // A drift beyond a day's is a realignment, whose aliases (the lamp's lines moved onto other lines)
  // a few lines can agree with: on the re-recorded sweep (200 instruments of 15400000) the one such
  // recalibration "paired" was 17 nm off, its 8 lines each on another line's peak.
  const dailyShare = dailyDriftShare(drift, context.domain);
  const checks: PairingCheck[] = [
    check(
      "pairs",
      pairs.length,
      pairs.length >= limits.minPairs,
      `only ${pairs.length} lamp lines sit on the drift from the previous calibration; at least ${limits.minPairs} are needed to trust it`,
    ),
    check(
      "residuals",
      scatter,
      scatter <= limits.maxScatter,
      `the lamp lines scatter by ${fitted.scatterX.toFixed(2)} x units about the drift from the previous calibration, as chance coincidences do`,
    ),
    check(
      "rival-pairing",
      rivalShare,
      rivalShare <= limits.maxRivalShare,
      `another drift of the previous calibration puts ${(100 * rivalShare).toFixed(0)} % as many lamp lines on peaks`,
    ),
    check(
      "drift-precision",
      1 - coveredShare,
      coveredShare >= limits.minCoveredShare,
      `the lamp lines fix the drift to ±${(limits.maxDriftSigma * tolerance).toFixed(2)} x units over only ${(100 * coveredShare).toFixed(0)} % of the array`,
    ),
    check(
      "previous-fit",
      previousFit,
      previousFit <= limits.maxPreviousRms,
      `the previous calibration fitted its own lamp lines to an RMS of ${previous.rmsNm.toFixed(3)} nm, too loosely to carry today's`,
    ),
    check(
      "daily-drift",
      dailyShare,
      dailyShare <= 1,
      `the array ${moved} and was ${stretchWords} since the previous calibration, more than a day's drift: a realigned instrument is trusted when a blind search finds the same axis, or when you confirm it`,
    ),
    check(
      "expected-lines",
      expectedShare,
      expectedShare >= limits.minExpectedShare,
      `only ${onArray.filter((p) => pairedLines.has(p.line)).length} of the ${onArray.length} strongest lamp lines found a peak where the moved calibration puts them`,
    ),
  ];
  const margins = [
    limits.minPairs > 0 ? Math.min(1, (pairs.length - limits.minPairs + 1) / 8) : 1,
    1 - scatter / limits.maxScatter,
    1 - rivalShare / limits.maxRivalShare,
    (coveredShare - limits.minCoveredShare) / (1 - limits.minCoveredShare),
    1 - previousFit / limits.maxPreviousRms,
    (expectedShare - limits.minExpectedShare) / (1 - limits.minExpectedShare),
  ];
  const margin = Math.min(1, Math.max(0, Math.min(...margins)));
  const passed = checks.every((c) => c.passed);
  const reasons = checks.filter((c) => !c.passed).map((c) => c.reason);
  const rivalPairs =
    rivalShare > limits.maxRivalShare ? rival.pairs.sort((a, b) => a.x - b.x) : undefined;
  return {
    status: passed ? "paired" : "check",
    checks,
    reasons,
    candidate: passed ? null : fit,
    confidence: passed ? 0.5 + 0.5 * margin : Math.min(0.49, 0.5 * margin),
    pairs: passed ? pairs : [],
    model: passed ? fit : null,
    suggestion: pairs,
    ...(rivalPairs ? { rivalSuggestion: rivalPairs } : {}),
    unmatchedPeaks: passed
      ? peaks.filter((_, i) => !pairs.some((p) => p.peakIndex === i))
      : peaks.slice(),
    unmatchedLines: candidateLines
      .filter((l) => !passed || !pairedLines.has(l))
      .map((l) => lines[l]),
    message: passed
      ? `recalibrated from the previous calibration (${moved}, ${stretchWords}): ${pairs.length} lamp lines agree, RMS ${fit.rmsNm.toFixed(4)} nm`
      : `check this recalibration: ${reasons.join("; ")}`,
  };
}

function signed(value: number, digits: number): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(digits)}`;
}

function check(
  name: PairingCheck["name"],
  value: number,
  passed: boolean,
  reason: string,
): PairingCheck {
  return { name, value, passed, reason: passed ? "" : reason };
}

/** A pair counts as on the drift within this many tolerances at most (a pulled or stray peak stands further off)… */
const ON_DRIFT_MAX = 0.15;
/** …and at least within this many, or 2.5 σ of its centre where that is wider. */
const ON_DRIFT_MIN = 0.1;
/**
 * The consensus that chooses the drift counts lines within this many tolerances only (measured on the
 * re-recorded sweep, seed 50000: a reach of 0.3 let pulled pairs tilt the drift, 3 silently wrong of 200).
 */
const CONSENSUS_REACH = 0.1;
/** Coarse rival drifts that are searched for a tight consensus of their own. */
const COARSE_RIVALS = 4;
/** Candidate pairs the consensus search draws its pairs of pairs from (heaviest first). */
const MAX_CANDIDATES = 160;

interface Candidate {
  pair: LampPair;
  u: number;
  weight: number;
  /** Largest residual on a drift for this pair to count as on it, x units. */
  reach: number;
}

/**
 * The drift most lamp lines agree on: each peak within a tolerance of where the coarse drift puts a
 * line is a candidate pair; every two candidates of different lines fix a drift, and the one on which
 * the most (and strongest) lines find a pair within a small reach wins. A dense lamp puts unlisted
 * lines next to listed ones, so the nearest peak is often not the line's own, and half the pairs may be
 * pulled: only a consensus that asks for tight agreement separates them. The winner is refitted by
 * weighted least squares on its pairs until they settle.
 */
function fitDrift(
  context: PairingContext,
  predicted: Predicted[],
  sortedX: number[],
  order: number[],
  tolerance: number,
  start: (u: number) => number,
  maxStretch: number,
): DriftFit | null {
  const candidates = candidatesNear(context, predicted, sortedX, order, tolerance, start);
  const best = consensus(candidates, tolerance, maxStretch);
  if (!best) return null;
  let kept = onDrift(candidates, best.at);
  let line: StraightFit | null = null;
  for (let round = 0; round < 4; round++) {
    line = straightFit(kept, tolerance);
    if (!line) return null;
    const next = onDrift(candidates, line.at);
    if (next.length < 2) return null;
    const same = next.length === kept.length && next.every((c, i) => c === kept[i]);
    kept = next;
    if (same) break;
  }
  line = straightFit(kept, tolerance);
  if (!line) return null;
  const keptLines = new Set(kept.map((c) => c.pair.lineIndex));
  // The lines that found no pair on the drift, with the peak nearest their place: set aside, shown.
  const rejected: LampPair[] = [];
  for (const l of new Set(candidates.map((c) => c.pair.lineIndex))) {
    if (keptLines.has(l)) continue;
    const own = candidates.filter((c) => c.pair.lineIndex === l);
    const nearest = own.reduce((a, b) =>
      Math.abs(b.pair.x - line!.at(b.u)) < Math.abs(a.pair.x - line!.at(a.u)) ? b : a,
    );
    rejected.push(nearest.pair);
  }
  return {
    pairs: kept.map((c) => c.pair).sort((a, b) => a.x - b.x),
    score: kept.reduce((sum, c) => sum + c.weight, 0),
    rejected,
    drift: line.drift,
    scatterX: line.scatter,
    bendX: bendOf(kept, line, context.domain),
  };
}

/** Every peak within a tolerance of where `start` puts each line, as a candidate pair. */
function candidatesNear(
  context: PairingContext,
  predicted: Predicted[],
  sortedX: number[],
  order: number[],
  tolerance: number,
  start: (u: number) => number,
): Candidate[] {
  const candidates: Candidate[] = [];
  for (const line of predicted) {
    const x = start(line.u);
    for (
      let k = lowerBound(sortedX, x - tolerance);
      k < sortedX.length && sortedX[k] <= x + tolerance;
      k++
    ) {
      const pair = pairOf(context, order[k], line);
      const sigma = pair.xUncertainty ?? 0;
      const reach = Math.min(
        ON_DRIFT_MAX * tolerance,
        Math.max(ON_DRIFT_MIN * tolerance, 2.5 * sigma),
      );
      candidates.push({ pair, u: line.u, weight: line.weight, reach });
    }
  }
  return candidates;
}

/**
 * The drift most candidates agree on tightly: every two candidates of different lines fix one, scored
 * by the weights of the lines with a candidate within the consensus reach; `accept` may refuse drifts.
 */
function consensus(
  candidates: Candidate[],
  tolerance: number,
  maxStretch: number,
  accept: (at: (u: number) => number) => boolean = () => true,
): { score: number; at: (u: number) => number } | null {
  const drawn = candidates
    .slice()
    .sort((a, b) => b.weight - a.weight)
    .slice(0, MAX_CANDIDATES);
  let best: { score: number; at: (u: number) => number } | null = null;
  for (let i = 0; i < drawn.length; i++) {
    for (let j = i + 1; j < drawn.length; j++) {
      const [p, q] = [drawn[i], drawn[j]];
      if (p.pair.lineIndex === q.pair.lineIndex || p.pair.peakIndex === q.pair.peakIndex) continue;
      const stretch = (q.pair.x - p.pair.x) / (q.u - p.u);
      if (!(Math.abs(stretch - 1) <= 1.5 * maxStretch)) continue;
      // The two candidates' line, refitted to the lines it gathers, is scored by how tightly they sit:
      // two near-equal sets of lines (the right drift, and one tilted to take in a few pulled peaks)
      // differ in how close their lines land, not in how many they gather (measured on the re-recorded
      // sweep, seeds 50000, 90000, 100000: 4 silent wrongs of 600 became 2, success +0.5–1.7 points).
      let at = (u: number) => p.pair.x + stretch * (u - p.u);
      const reach = CONSENSUS_REACH * tolerance;
      const gathered = onDrift(candidates, at, reach);
      const refitted = gathered.length >= 3 ? plainLine(gathered) : null;
      if (refitted && Math.abs(refitted.stretch - 1) <= 1.5 * maxStretch) at = refitted.at;
      const score = onDrift(candidates, at, reach).reduce(
        (sum, c) => sum + c.weight * (1 - ((c.pair.x - at(c.u)) / reach) ** 2),
        0,
      );
      if ((!best || score > best.score) && accept(at)) best = { score, at };
    }
  }
  return best;
}

/** x = x̄ + stretch·(u − ū) by ordinary least squares (the consensus's quick refit); null when u does not vary. */
function plainLine(pairs: Candidate[]): { stretch: number; at: (u: number) => number } | null {
  const n = pairs.length;
  const uMean = pairs.reduce((sum, c) => sum + c.u, 0) / n;
  const xMean = pairs.reduce((sum, c) => sum + c.pair.x, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (const c of pairs) {
    sxy += (c.u - uMean) * (c.pair.x - xMean);
    sxx += (c.u - uMean) ** 2;
  }
  if (!(sxx > 0)) return null;
  const stretch = sxy / sxx;
  return { stretch, at: (u) => xMean + stretch * (u - uMean) };
}

/** Each line's candidate nearest the drift `at`, when within its reach; a peak keeps its nearest line. */
function onDrift(
  candidates: Candidate[],
  at: (u: number) => number,
  reachCap = Infinity,
): Candidate[] {
  const byLine = new Map<number, { candidate: Candidate; miss: number }>();
  for (const c of candidates) {
    const miss = Math.abs(c.pair.x - at(c.u));
    if (miss > Math.min(c.reach, reachCap)) continue;
    const current = byLine.get(c.pair.lineIndex);
    if (!current || miss < current.miss) byLine.set(c.pair.lineIndex, { candidate: c, miss });
  }
  const byPeak = new Map<number, { candidate: Candidate; miss: number }>();
  for (const entry of byLine.values()) {
    const current = byPeak.get(entry.candidate.pair.peakIndex);
    if (!current || entry.miss < current.miss) byPeak.set(entry.candidate.pair.peakIndex, entry);
  }
  return [...byPeak.values()].map((e) => e.candidate).sort((a, b) => a.u - b.u);
}

/** The pair of one peak and one predicted line, with a blend group's top's σ in its x σ. */
function pairOf(context: PairingContext, peak: number, line: Predicted): LampPair {
  const pair = toLampPair(context, peak, line.line);
  return line.sigmaX > 0
    ? { ...pair, xUncertainty: Math.hypot(pair.xUncertainty ?? 0, line.sigmaX) }
    : pair;
}

interface StraightFit {
  at: (u: number) => number;
  drift: LinearDrift;
  /** RMS of the pairs about the line, x units (dof-corrected; infinite with two pairs). */
  scatter: number;
}

/**
 * x = a + s·(u − ū) by weighted least squares. A peak finder's σ of a centre is a guide, not a measure:
 * a sharp peak pulled by an unlisted neighbour claims a tiny σ, a saturated one a huge σ. So σ is held
 * between a tenth of a tolerance (about how well a line's centre is known anyway, common practice) and
 * the reach on the drift, and no single pair can carry the fit.
 */
function straightFit(pairs: Candidate[], tolerance: number): StraightFit | null {
  if (pairs.length < 2) return null;
  const uMean = pairs.reduce((sum, c) => sum + c.u, 0) / pairs.length;
  const sigmas = pairs.map((c) =>
    Math.min(
      Math.max(c.pair.xUncertainty ?? 0, ON_DRIFT_MIN * tolerance),
      ON_DRIFT_MAX * tolerance,
    ),
  );
  let solution;
  try {
    solution = weightedLeastSquares(
      pairs.map((c) => [1, c.u - uMean]),
      pairs.map((c) => c.pair.x),
      sigmas,
    );
  } catch {
    return null;
  }
  const [a, s] = solution.parameters;
  if (!(s > 0)) return null;
  const dof = pairs.length - 2;
  const residuals = pairs.map((c) => c.pair.x - (a + s * (c.u - uMean)));
  const scatter =
    dof > 0
      ? Math.sqrt(residuals.reduce((sum, r) => sum + r * r, 0) / dof)
      : Number.POSITIVE_INFINITY;
  // The covariance is scaled by the reduced χ² when the pairs scatter more than their σ say.
  const inflation = dof > 0 ? Math.max(1, solution.chiSquare / dof) : 1;
  const c = solution.unscaledCovariance;
  return {
    at: (u) => a + s * (u - uMean),
    drift: {
      stretch: s,
      offset: a - s * uMean,
      pivot: a,
      covariance: [
        [inflation * c[0][0], inflation * c[0][1]],
        [inflation * c[1][0], inflation * c[1][1]],
      ],
    },
    scatter,
  };
}

/** How far a quadratic drift departs from the straight one on the array, when its curvature is significant. */
function bendOf(pairs: Candidate[], straight: StraightFit, [xMin, xMax]: [number, number]): number {
  if (pairs.length < 6) return 0;
  const half = 0.5 * (xMax - xMin);
  const centre = 0.5 * (xMin + xMax);
  const vs = pairs.map((c) => (c.u - centre) / half);
  let solution;
  try {
    solution = weightedLeastSquares(
      vs.map((v) => [1, v, v * v]),
      pairs.map((c) => c.pair.x),
      pairs.map(() => 1),
    );
  } catch {
    return 0;
  }
  const [c0, c1, c2] = solution.parameters;
  const sigma2 = solution.chiSquare / Math.max(pairs.length - 3, 1);
  const c2Sigma = Math.sqrt(sigma2 * solution.unscaledCovariance[2][2]);
  if (!(Math.abs(c2) > 3 * c2Sigma)) return 0;
  let largest = 0;
  for (let k = 0; k <= 20; k++) {
    const v = -1 + k / 10;
    const u = centre + v * half;
    largest = Math.max(largest, Math.abs(c0 + c1 * v + c2 * v * v - straight.at(u)));
  }
  return largest;
}

/**
 * How large `drift` is against a day's (RECALIBRATION_LIMITS.maxDailyStretch and maxDailyShiftShare):
 * the larger of its stretch and its shift at the array's middle, each over its daily bound (≤ 1 is a
 * day's drift).
 */
function dailyDriftShare(drift: LinearDrift, [xMin, xMax]: [number, number]): number {
  const limits = RECALIBRATION_LIMITS;
  const middle = 0.5 * (xMin + xMax);
  const shift = drift.stretch * middle + drift.offset - middle;
  return Math.max(
    Math.abs(drift.stretch - 1) / limits.maxDailyStretch,
    Math.abs(shift) / (limits.maxDailyShiftShare * (xMax - xMin)),
  );
}

/**
 * Where today's calibration is known: yesterday's covered range moved by the drift, narrowed to where the
 * drift's own 1σ stays within maxDriftSigma tolerances (it grows away from the lines' weighted middle)
 * and to maxExtrapolationShare of the array beyond the outermost lines. Empty ([c, c]) when the lines
 * fix the drift nowhere that well.
 */
function coveredByDrift(
  drift: LinearDrift,
  previous: CalibrationModel,
  pairs: readonly LampPair[],
  [xMin, xMax]: [number, number],
  tolerance: number,
): [number, number] {
  const limits = RECALIBRATION_LIMITS;
  const xs = pairs.map((p) => p.x).sort((a, b) => a - b);
  const span = xMax - xMin;
  // A day's drift keeps yesterday's shape, so it holds a little beyond today's lines. A large one is a
  // realigned instrument whose shape may have bent: it is trusted only between the lines, the outermost
  // at each end left out (one chance coincidence far from the rest would otherwise stretch it).
  const small = dailyDriftShare(drift, [xMin, xMax]) <= 1;
  const inner = xs.length >= 4 && !small ? xs.slice(1, -1) : xs;
  const reach = small ? limits.maxExtrapolationShare * span : 0;
  let low = Math.max(xMin, drift.stretch * previous.coveredX[0] + drift.offset, inner[0] - reach);
  let high = Math.min(
    xMax,
    drift.stretch * previous.coveredX[1] + drift.offset,
    inner[inner.length - 1] + reach,
  );
  // σ²(x) = c₀₀ + 2c₀₁d + c₁₁d² with d = (x − pivot)/stretch, the pivot being the pairs' mean u moved.
  const [[c00, c01], [, c11]] = drift.covariance;
  const limit = (limits.maxDriftSigma * tolerance) ** 2;
  const none: [number, number] = [drift.pivot, drift.pivot];
  if (!(c11 > 0)) return c00 <= limit ? [low, high] : none;
  const centre = -c01 / c11;
  const square = centre * centre - (c00 - limit) / c11;
  if (!(square > 0)) return none;
  low = Math.max(low, drift.pivot + drift.stretch * (centre - Math.sqrt(square)));
  high = Math.min(high, drift.pivot + drift.stretch * (centre + Math.sqrt(square)));
  return high > low ? [low, high] : none;
}

/** The drifted model with today's pairs' residuals, in the shape every fit returns. */
function fitResult(
  model: CalibrationModel,
  drift: LinearDrift,
  fitted: DriftFit,
  [low, high]: [number, number],
): FitCalibrationResult {
  const all = [...fitted.pairs, ...fitted.rejected];
  const evaluation = modelEvaluation(
    model,
    all.map((p) => p.x),
  );
  const residuals = all.map((p, i) => p.wavelengthNm - evaluation.wavelengthNm[i]);
  const used = fitted.pairs.length;
  const rmsNm = Math.sqrt(residuals.slice(0, used).reduce((s, r) => s + r * r, 0) / used);
  const chiSquare = fitted.pairs.reduce((s, p, i) => {
    const sigma = (p.xUncertainty ?? 1) * Math.abs(evaluation.dispersion[i]);
    return s + (residuals[i] / sigma) ** 2;
  }, 0);
  const coveredNm = modelEvaluation(model, [low, high]).wavelengthNm;
  const finished: CalibrationModel = {
    ...model,
    coveredX: [low, high],
    coveredNm: [Math.min(coveredNm[0], coveredNm[1]), Math.max(coveredNm[0], coveredNm[1])],
    rmsNm,
    dof: used - 2,
    pairCount: used,
    chiSquare,
  };
  const fittedPairs = all.map((p, i) => ({ ...p, residualNm: residuals[i], used: i < used }));
  return {
    model: finished,
    pairs: fittedPairs,
    rejected: fittedPairs.slice(used),
    rmsNm,
    dof: used - 2,
    warnings:
      fitted.rejected.length > 0
        ? [
            {
              code: "outliers-rejected",
              message: `${fitted.rejected.length} lamp peak(s) near a predicted line stood off the drift and were set aside`,
            },
          ]
        : [],
  };
}
