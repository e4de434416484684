// The refinement both pairing entry points share: from a first guess of where each line falls, match
// lines with peaks, fit, match again with the fit at a tighter tolerance, and judge the result.
import type { DispersionKind } from "../types";
import { CalibrationError } from "./calibration-error";
import { fitCalibration, type FitCalibrationOptions, type FitCalibrationResult } from "./fit-calibration";
import { calibrationUncertainty } from "./calibration-uncertainty";
import { fitPrismModel } from "./fit-prism-model";
import { GLASS_NAMES, type GlassName } from "./glass-catalogue";
import type { LampLine, LampPair, LampPairingResult, LampPeak } from "./lamp-pairing-types";
import { modelEvaluation, prismGeometryOf } from "./model-evaluation";
import { prismForwardX } from "./prism-forward";
import { weightedLeastSquares } from "./weighted-least-squares";

/** Everything the refinement needs, prepared by the caller. */
export interface PairingContext {
  peaks: LampPeak[];
  lines: LampLine[];
  /** Indices of the lines inside the nominal range (plus margin). */
  candidateLines: number[];
  dispersion: DispersionKind;
  domain: [number, number];
  /** Matching half-width in x units at the end of refinement. */
  toleranceX: number;
  minConfidence: number;
  /** Pairs that must stay (manual seeds), as peak index → line index. */
  forced: Map<number, number>;
  nominalRangeNm: [number, number];
  /** The axis g(λ) in which the expected dispersion is nearly a straight line. */
  straighten: (lambda: number) => number;
}

/** Where the current model puts a line on the array, and how uncertain that place is (1σ, x units). */
interface Prediction {
  x: (lambda: number) => number;
  sigmaX: (lambda: number) => number;
}

/** Lines weaker than this fraction of a neighbour within one resolution element do not compete with it. */
const BLEND_INTENSITY_RATIO = 0.1;

/**
 * One-to-one matching of lines with peaks. Each line's window is the tolerance plus 3σ of its predicted
 * place (wide where the model extrapolates, narrow where pairs pin it); the window is in x, so in nm it
 * follows the local dispersion. A peak whose window holds two lines of comparable strength closer than
 * one resolution element (2·context.toleranceX) is a blend the data cannot split: it is left unpaired.
 * The rest is assigned greedily by the smallest normalised residual |Δx|/window.
 */
function matchOneToOne(context: PairingContext, prediction: Prediction, toleranceX: number): LampPair[] {
  const { peaks, lines, candidateLines, forced } = context;
  const order = peaks.map((_, i) => i).sort((a, b) => peaks[a].x - peaks[b].x);
  const sortedX = order.map((i) => peaks[i].x);
  const forcedLines = new Set(forced.values());
  const candidates: { line: number; peak: number; distance: number }[] = [];
  const linesOfPeak = new Map<number, { line: number; x: number }[]>();
  for (const l of candidateLines) {
    if (forcedLines.has(l)) continue;
    const x = prediction.x(lines[l].wavelengthNm);
    const sigma = prediction.sigmaX(lines[l].wavelengthNm);
    const window = toleranceX + 3 * (Number.isFinite(sigma) ? sigma : 0);
    if (!(x >= context.domain[0] - window && x <= context.domain[1] + window)) continue;
    let low = 0;
    let high = sortedX.length;
    while (low < high) {
      const mid = (low + high) >> 1;
      if (sortedX[mid] < x - window) low = mid + 1;
      else high = mid;
    }
    for (let k = low; k < sortedX.length && sortedX[k] <= x + window; k++) {
      const p = order[k];
      if (forced.has(p)) continue;
      candidates.push({ line: l, peak: p, distance: Math.abs(sortedX[k] - x) / window });
      const list = linesOfPeak.get(p) ?? [];
      list.push({ line: l, x });
      linesOfPeak.set(p, list);
    }
  }
  const blended = new Set<number>();
  for (const [p, list] of linesOfPeak) {
    const strongest = Math.max(...list.map((c) => lines[c.line].intensity));
    const competing = list.filter((c) => lines[c.line].intensity >= BLEND_INTENSITY_RATIO * strongest);
    // Two comparable lines inside the peak's windows: either a blend (closer than the resolution) or a
    // model too uncertain there to tell them apart (the far blue of a prism, before the physical model);
    // either way the data cannot say which, so the peak waits for a better model.
    if (competing.length >= 2) blended.add(p);
  }
  candidates.sort((a, b) => a.distance - b.distance || a.line - b.line || a.peak - b.peak);
  const takenLines = new Set<number>();
  const takenPeaks = new Set<number>();
  const pairs: LampPair[] = [];
  for (const [p, l] of forced) pairs.push(toPair(context, p, l));
  for (const c of candidates) {
    if (blended.has(c.peak) || takenLines.has(c.line) || takenPeaks.has(c.peak)) continue;
    takenLines.add(c.line);
    takenPeaks.add(c.peak);
    pairs.push(toPair(context, c.peak, c.line));
  }
  return pairs.sort((a, b) => a.x - b.x);
}

function median(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/** Tukey's biweight weight of a residual r at tuning constant c (zero beyond c). */
function biweight(r: number, c: number): number {
  const u = r / c;
  return Math.abs(u) < 1 ? (1 - u * u) ** 2 : 0;
}

/**
 * While pairing, the dispersion is fitted forwards, x as a polynomial in the straightened axis g(λ):
 * linear least squares, fast, and flexible enough for a strongly curved prism, where the Hartmann
 * formula over a wide range is off by several pixels in the blue. The fit is iteratively reweighted
 * (Tukey's biweight on x residuals, scale floored at half the tolerance so the model's own shape error
 * is not mistaken for outliers), so one wrong pair does not drag the predictions of its neighbours.
 */
function forwardFit(context: PairingContext, pairs: LampPair[], degree: number): (Prediction & { rmsX: number }) | null {
  const [low, high] = context.nominalRangeNm;
  const g = context.straighten;
  const gLow = g(low);
  const gHigh = g(high);
  const normalised = (lambda: number) => (2 * (g(lambda) - gLow)) / (gHigh - gLow) - 1;
  const row = (lambda: number) => Array.from({ length: degree + 1 }, (_, k) => normalised(lambda) ** k);
  const design = pairs.map((p) => row(p.wavelengthNm));
  const sigma = pairs.map((p) => p.xUncertainty ?? 1);
  let weights = pairs.map(() => 1);
  let solution: { parameters: number[]; covariance: number[][]; rmsX: number } | null = null;
  for (let pass = 0; pass < 4; pass++) {
    const kept = weights.flatMap((w, i) => (w > 0 ? [i] : []));
    if (kept.length <= degree + 1) break;
    let fit;
    try {
      fit = weightedLeastSquares(
        kept.map((i) => design[i]),
        kept.map((i) => pairs[i].x),
        kept.map((i) => sigma[i] / Math.sqrt(weights[i])),
      );
    } catch {
      break;
    }
    const residuals = pairs.map((p, i) => p.x - design[i].reduce((s, v, k) => s + v * fit.parameters[k], 0));
    const dof = kept.length - degree - 1;
    const variance = Math.max(fit.chiSquare / dof, 1);
    const rmsX = Math.sqrt(kept.reduce((s, i) => s + residuals[i] ** 2, 0) / dof);
    solution = { parameters: fit.parameters, covariance: fit.unscaledCovariance.map((r) => r.map((v) => v * variance)), rmsX };
    const scale = Math.max(1.4826 * median(residuals.map(Math.abs)), 0.5 * context.toleranceX);
    weights = residuals.map((r) => biweight(r, 4.685 * scale));
  }
  if (!solution) return null;
  const { parameters, covariance, rmsX } = solution;
  return {
    rmsX,
    x: (lambda: number) => row(lambda).reduce((sum, v, k) => sum + v * parameters[k], 0),
    sigmaX: (lambda: number) => {
      const f = row(lambda);
      let variance = 0;
      for (let a = 0; a < f.length; a++) for (let b = 0; b < f.length; b++) variance += f[a] * covariance[a][b] * f[b];
      return Math.sqrt(Math.max(variance, 0));
    },
  };
}

function toPair(context: PairingContext, peakIndex: number, lineIndex: number): LampPair {
  const peak = context.peaks[peakIndex];
  const line = context.lines[lineIndex];
  return {
    x: peak.x,
    ...(peak.xUncertainty !== undefined ? { xUncertainty: peak.xUncertainty } : {}),
    wavelengthNm: line.wavelengthNm,
    species: line.species,
    lineId: line.id,
    peakIndex,
    lineIndex,
  };
}

/**
 * The glass whose physical prism model explains most pairs: each glass is fitted once by least squares
 * and scored with a bounded loss Σ min((r/c)², 1), c = the tolerance in x, so a wrong pair costs at most
 * 1 however far off it is; the three best are refitted twice with biweight weights, which lets the right
 * glass pass through the good pairs and leave a wrong far-blue pair far off, instead of a wrong glass
 * bending to absorb it. Returns the glass and the pairs its fit keeps (|r| < c).
 */
function robustGlasses(context: PairingContext, pairs: LampPair[]): { glass: GlassName; kept: LampPair[] }[] {
  const c = context.toleranceX;
  const x = pairs.map((p) => p.x);
  const wavelengthNm = pairs.map((p) => p.wavelengthNm);
  const sigma = pairs.map((p) => p.xUncertainty ?? 1);
  const fitWith = (glass: GlassName, weights: number[]) => {
    const kept = weights.flatMap((w, i) => (w > 0 ? [i] : []));
    if (kept.length < 5) return null;
    try {
      const model = fitPrismModel(
        {
          x: kept.map((i) => x[i]),
          wavelengthNm: kept.map((i) => wavelengthNm[i]),
          xUncertainty: kept.map((i) => sigma[i] / Math.sqrt(weights[i])),
          domain: context.domain,
        },
        { glass, apexDeg: 60, fitApex: false, scaling: "residual" },
      );
      const geometry = prismGeometryOf(model);
      const residuals = wavelengthNm.map((lambda, i) => x[i] - prismForwardX(geometry, lambda));
      if (!residuals.every(Number.isFinite)) return null;
      return { residuals, loss: residuals.reduce((s, r) => s + Math.min((r / c) ** 2, 1), 0) };
    } catch (error) {
      if (error instanceof CalibrationError) return null;
      throw error;
    }
  };
  const first = GLASS_NAMES.map((glass) => ({ glass, fit: fitWith(glass, pairs.map(() => 1)) }))
    .filter((g): g is { glass: GlassName; fit: NonNullable<ReturnType<typeof fitWith>> } => g.fit !== null)
    .sort((a, b) => a.fit.loss - b.fit.loss)
    .slice(0, 3);
  const refined: { glass: GlassName; residuals: number[]; loss: number }[] = [];
  for (const { glass, fit } of first) {
    let current = fit;
    for (let pass = 0; pass < 2; pass++) {
      const scale = Math.max(1.4826 * median(current.residuals.map(Math.abs)), 0.25 * c);
      const next = fitWith(glass, current.residuals.map((r) => biweight(r, 4.685 * scale)));
      if (!next) break;
      current = next;
    }
    refined.push({ glass, ...current });
  }
  return refined
    .sort((a, b) => a.loss - b.loss)
    .map((g) => ({ glass: g.glass, kept: pairs.filter((_, i) => Math.abs(g.residuals[i]) < c) }));
}

/** The calibration fitted to the final pairs: a polynomial for a grating; for a prism the physical model
 * of the most consistent glass, else Hartmann, else a polynomial; outliers rejected unless seeds are forced. */
function finalFit(context: PairingContext, pairs: LampPair[], glass?: GlassName): { fit: FitCalibrationResult; pairs: LampPair[]; glass?: GlassName } | null {
  const rejectOutliers = context.forced.size === 0;
  let chosenGlass = glass;
  let input = pairs;
  if (context.dispersion === "prism" && !chosenGlass) {
    const robust = robustGlasses(context, pairs)[0];
    if (robust) {
      chosenGlass = robust.glass;
      // Forced (manual) pairs stay whatever the robust fit thinks of them.
      input = rejectOutliers ? robust.kept : pairs;
    }
  }
  const n = input.length;
  const attempts: FitCalibrationOptions[] =
    context.dispersion === "prism"
      ? [
          ...(chosenGlass ? [{ model: "prism" as const, glass: chosenGlass }] : []),
          { model: "hartmann" },
          { model: "polynomial", degree: Math.min(5, n - 2) },
        ]
      : [{ model: "polynomial", degree: n >= 10 ? 3 : n >= 6 ? 2 : 1 }, { model: "polynomial", degree: 1 }];
  // Over a wide range a strongly dispersing prism defeats Hartmann and polynomials alike (errors of nm
  // at the ends), so the physical model is kept whenever it fits; the others are fallbacks.
  for (const options of attempts) {
    if (n < 2) break;
    try {
      const fit = fitCalibration(input, { ...options, domain: context.domain, rejectOutliers });
      return { fit, pairs: input, glass: options.model === "prism" ? chosenGlass : undefined };
    } catch (error) {
      if (!(error instanceof CalibrationError)) throw error;
    }
  }
  return null;
}

/** Pairs after refinement, before the final calibration fit. */
export interface RefinedPairing {
  pairs: LampPair[];
  /** RMS of the forward fit's residuals, x units. */
  rmsX: number;
  /** Pairs × precision: ranks refinements cheaply before the one final fit. */
  score: number;
}

/** Iterates match → robust forward fit from the first guess `initialPairs`, tightening the tolerance. */
export function refineLampPairs(context: PairingContext, initialPairs: LampPair[]): RefinedPairing {
  let pairs = initialPairs;
  // Tolerance schedule, in multiples of the final tolerance: wide while the model is crude.
  const schedule = [3, 2, 1.5, 1, 1, 1];
  let rmsX = Infinity;
  for (let stage = 0; stage < schedule.length && pairs.length >= 3; stage++) {
    const degree = Math.max(1, Math.min(stage + 2, 3, pairs.length - 3));
    const prediction = forwardFit(context, pairs, degree);
    if (!prediction) break;
    pairs = matchOneToOne(context, prediction, schedule[stage] * context.toleranceX);
    const check = pairs.length > degree + 1 ? forwardFit(context, pairs, degree) : null;
    rmsX = check ? check.rmsX : Infinity;
  }
  const precision = Math.min(Math.max(1 - (2 * rmsX) / context.toleranceX, 0), 1);
  return { pairs, rmsX, score: pairs.length * precision };
}

/** x(λ) of a fitted calibration, by interpolating its λ on a dense grid over the domain. */
function inverseOf(context: PairingContext, fit: FitCalibrationResult): (lambda: number) => number {
  const { model } = fit;
  if (model.kind === "prism") {
    const geometry = prismGeometryOf(model);
    return (lambda: number) => prismForwardX(geometry, lambda);
  }
  const [xMin, xMax] = context.domain;
  const grid = Array.from({ length: 4097 }, (_, i) => xMin + ((xMax - xMin) * i) / 4096);
  const lambda = modelEvaluation(model, grid).wavelengthNm;
  const rising = lambda[lambda.length - 1] > lambda[0];
  return (target: number) => {
    let low = 0;
    let high = grid.length - 1;
    const value = (i: number) => (rising ? lambda[i] : -lambda[i]);
    const goal = rising ? target : -target;
    if (!(goal >= value(low) && goal <= value(high))) return Number.NaN;
    while (high - low > 1) {
      const mid = (low + high) >> 1;
      if (value(mid) <= goal) low = mid;
      else high = mid;
    }
    return grid[low] + ((grid[high] - grid[low]) * (goal - value(low))) / (value(high) - value(low) || 1);
  };
}

/** Where a fitted calibration puts each line, with the 1σ of that place from its covariance, in x. */
function predictionOf(context: PairingContext, fit: FitCalibrationResult): Prediction {
  const xOf = inverseOf(context, fit);
  const { lines, candidateLines } = context;
  const places = candidateLines.map((l) => xOf(lines[l].wavelengthNm));
  const inside = places.map((x) => (Number.isFinite(x) ? Math.min(Math.max(x, context.domain[0]), context.domain[1]) : context.domain[0]));
  const sigmaNm = calibrationUncertainty(fit.model, new Float64Array(inside));
  const dispersion = modelEvaluation(fit.model, inside).dispersion;
  const sigmaByLambda = new Map(
    candidateLines.map((l, k) => [lines[l].wavelengthNm, sigmaNm[k] / Math.max(Math.abs(dispersion[k]), 1e-12)]),
  );
  return { x: xOf, sigmaX: (lambda: number) => sigmaByLambda.get(lambda) ?? 0 };
}

/**
 * Fits the final calibration to refined pairs, re-matches once with it and refits, then judges the
 * result. For a prism the glass is chosen once (robustly, over the catalogue) and kept for the refit:
 * the physical model extrapolates into the far blue far better than the forward polynomial that made
 * the pairs there, so the re-match repairs them.
 */
export function finishLampPairing(context: PairingContext, refined: RefinedPairing): LampPairingResult {
  const starts: { pairs: LampPair[]; glass?: GlassName }[] =
    context.dispersion === "prism" && refined.pairs.length >= 5
      ? robustGlasses(context, refined.pairs).map((g) => ({ pairs: context.forced.size === 0 ? g.kept : refined.pairs, glass: g.glass }))
      : [];
  if (starts.length === 0) starts.push({ pairs: refined.pairs });
  let best: { final: NonNullable<ReturnType<typeof finalFit>>; score: number } | undefined;
  for (const start of starts) {
    let final = start.pairs.length >= 3 ? finalFit(context, start.pairs, start.glass) : null;
    if (!final) continue;
    const rematched = matchOneToOne(context, predictionOf(context, final.fit), context.toleranceX);
    const refit = rematched.length >= 3 ? finalFit(context, rematched, final.glass) : null;
    if (refit && usedCount(refit.fit) >= usedCount(final.fit)) final = refit;
    const score = evidence(context, final);
    if (!best || score > best.score) best = { final, score };
  }
  const fit = best?.final.fit ?? null;
  const pairs = best?.final.pairs ?? refined.pairs;
  const usedPairs = fit ? pairs.filter((_, i) => fit.pairs[i].used) : [];
  const forward = usedPairs.length > 5 ? forwardFit(context, usedPairs, 3) : null;
  const rmsX = forward ? forward.rmsX : refined.rmsX;
  return judge(context, usedPairs, fit, rmsX);
}

function usedCount(fit: FitCalibrationResult): number {
  return fit.pairs.filter((p) => p.used).length;
}

/**
 * How well a final calibration is borne out by the lamp: pairs it uses, less half a point for each of
 * the strongest quarter of the lines that it puts on the array where no peak is. Two glasses can both
 * fit their own pairs (a wrong glass bends to fit a wrong far-blue pair); the missing strong lines tell
 * them apart.
 */
function evidence(context: PairingContext, final: NonNullable<ReturnType<typeof finalFit>>): number {
  const { lines, candidateLines, peaks } = context;
  const xOf = inverseOf(context, final.fit);
  const intensities = candidateLines.map((l) => lines[l].intensity).sort((a, b) => a - b);
  const strong = intensities[Math.floor(0.75 * (intensities.length - 1))];
  let missing = 0;
  for (const l of candidateLines) {
    if (lines[l].intensity < strong) continue;
    const x = xOf(lines[l].wavelengthNm);
    if (!(x >= context.domain[0] && x <= context.domain[1])) continue;
    if (!peaks.some((p) => Math.abs(p.x - x) <= context.toleranceX)) missing++;
  }
  return usedCount(final.fit) - 0.5 * missing;
}

/** Refines and finishes in one go. */
export function refineLampPairing(context: PairingContext, initialPairs: LampPair[]): LampPairingResult {
  return finishLampPairing(context, refineLampPairs(context, initialPairs));
}

function judge(context: PairingContext, pairs: LampPair[], fit: FitCalibrationResult | null, rmsX: number): LampPairingResult {
  const { peaks, lines, candidateLines } = context;
  const pairedPeaks = new Set(pairs.map((p) => p.peakIndex));
  const pairedLines = new Set(pairs.map((p) => p.lineIndex));
  let confidence = 0;
  if (fit) {
    // Lines the fit puts on the array; as many of the strongest as there are peaks should have been seen.
    const ends = modelEvaluation(fit.model, [context.domain[0], context.domain[1]]).wavelengthNm;
    const [low, high] = [Math.min(ends[0], ends[1]), Math.max(ends[0], ends[1])];
    const onArray = candidateLines
      .filter((l) => lines[l].wavelengthNm >= low && lines[l].wavelengthNm <= high)
      .sort((a, b) => lines[b].intensity - lines[a].intensity);
    const strongestLines = onArray.slice(0, Math.max(1, Math.min(peaks.length, onArray.length)));
    const lineFraction = strongestLines.filter((l) => pairedLines.has(l)).length / strongestLines.length;
    const strongestPeaks = peaks
      .map((_, i) => i)
      .sort((a, b) => peaks[b].height - peaks[a].height)
      .slice(0, Math.min(10, peaks.length));
    const peakFraction = strongestPeaks.filter((p) => pairedPeaks.has(p)).length / strongestPeaks.length;
    const parameters = fit.model.parameters.length;
    const pairFactor = 1 - Math.exp(-Math.max(pairs.length - parameters, 0) / 4);
    const precision = Math.min(Math.max(1 - (2 * rmsX) / context.toleranceX, 0), 1);
    confidence = (0.5 * lineFraction + 0.5 * peakFraction) * pairFactor * precision;
  }
  const paired = fit !== null && confidence >= context.minConfidence;
  const unmatchedPeaks = paired ? peaks.filter((_, i) => !pairedPeaks.has(i)) : peaks.slice();
  const unmatchedLines = candidateLines.filter((l) => !paired || !pairedLines.has(l)).map((l) => lines[l]);
  return {
    status: paired ? "paired" : "needs-manual",
    confidence,
    pairs: paired ? pairs : [],
    model: paired ? fit : null,
    suggestion: pairs,
    unmatchedPeaks,
    unmatchedLines,
    message: paired
      ? `paired ${pairs.length} of ${peaks.length} peaks (confidence ${confidence.toFixed(2)}, RMS ${fit!.rmsNm.toFixed(4)} nm)`
      : `no trustworthy pairing (confidence ${confidence.toFixed(2)} < ${context.minConfidence}): ` +
        `pair two or three peaks by hand and extend from there`,
  };
}
