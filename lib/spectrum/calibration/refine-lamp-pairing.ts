// The refinement both pairing entry points share: from a first guess of where each line falls, match
// lines with peaks, fit, match again with the fit at a tighter tolerance, and judge the result.
import { prismRefitOptions } from "./prism-refit-options";
import type { DispersionKind } from "../types";
import {
  fitCalibration,
  type FitCalibrationOptions,
  type FitCalibrationResult,
} from "./fit-calibration";
import { informationCriteria } from "./information-criteria";
import type { LampPair, LampPairingResult } from "./lamp-pairing-types";
import type { PairingContext } from "./pairing-context";
import type { CalibrationModel } from "./calibration-model";
import { modelEvaluation } from "./model-evaluation";
import { inverseOfModel } from "./inverse-of-model";
import { growLampPairs } from "./grow-lamp-pairs";
import { lampLineBlended } from "./lamp-line-blended";
import { toLampPair } from "./to-lamp-pair";
import { typicalPeakFwhm } from "./typical-peak-fwhm";
import { fitForwardHartmann } from "./fit-forward-hartmann";
import { verifyLampPairing, type PairingVerdict } from "./verify-lamp-pairing";
import { trimPulledEnds } from "./trim-pulled-ends";
import { claimSoundEnds } from "./claim-sound-ends";
import { describePairs } from "./describe-pairs";
import { weightedLeastSquares } from "./weighted-least-squares";
import { lowerBound } from "../matching/lower-bound";

/** `place` remembered per wavelength: the blend test asks again for every candidate line's place. */
function placedOnce(place: (wavelengthNm: number) => number): (wavelengthNm: number) => number {
  const placed = new Map<number, number>();
  return (wavelengthNm) => {
    let x = placed.get(wavelengthNm);
    if (x === undefined) placed.set(wavelengthNm, (x = place(wavelengthNm)));
    return x;
  };
}

/**
 * Pairs each candidate line with the nearest peak to its predicted x; a peak keeps its closest line. A
 * line blended with a neighbour into one peak is left out: the peak's centre belongs to neither.
 */
function matchByPrediction(
  context: PairingContext,
  predictX: (lambda: number) => number,
  toleranceX: number,
): LampPair[] {
  const { peaks, lines, candidateLines, forced } = context;
  const order = peaks.map((_, i) => i).sort((a, b) => peaks[a].x - peaks[b].x);
  const sortedX = order.map((i) => peaks[i].x);
  const forcedLines = new Set(forced.values());
  const best = new Map<number, { line: number; distanceX: number }>();
  // The blend test below asks for every candidate's place again for each line: each is computed once.
  const placedX = placedOnce(predictX);
  for (const l of candidateLines) {
    if (forcedLines.has(l)) continue;
    const x = placedX(lines[l].wavelengthNm);
    if (!(x >= context.domain[0] - toleranceX && x <= context.domain[1] + toleranceX)) continue;
    const low = lowerBound(sortedX, x);
    for (const k of [low - 1, low]) {
      if (k < 0 || k >= sortedX.length) continue;
      const p = order[k];
      const distanceX = Math.abs(sortedX[k] - x);
      if (forced.has(p) || distanceX > toleranceX) continue;
      // Without a measured width a blend cannot be told from a line (the outlier rejection is then the guard).
      const fwhmX = peaks[p].fwhm;
      if (fwhmX !== undefined && lampLineBlended(lines, candidateLines, l, placedX, fwhmX))
        continue;
      const current = best.get(p);
      if (!current || distanceX < current.distanceX) best.set(p, { line: l, distanceX });
    }
  }
  const pairs: LampPair[] = [];
  for (const [p, l] of forced) pairs.push(toLampPair(context, p, l));
  for (const [p, { line }] of best) pairs.push(toLampPair(context, p, line));
  return pairs.sort((a, b) => a.x - b.x);
}

/**
 * While pairing, the dispersion is fitted forwards, x as a polynomial in the straightened axis g(λ):
 * linear least squares, fast, and flexible enough for a strongly curved prism, where the Hartmann
 * formula over a wide range is off by several pixels in the blue.
 */
function forwardFit(
  context: PairingContext,
  pairs: LampPair[],
  degree: number,
): ((lambda: number) => number) | null {
  const [low, high] = context.nominalRangeNm;
  const g = context.straighten;
  const gLow = g(low);
  const gHigh = g(high);
  const normalised = (lambda: number) => (2 * (g(lambda) - gLow)) / (gHigh - gLow) - 1;
  const design = pairs.map((p) =>
    Array.from({ length: degree + 1 }, (_, k) => normalised(p.wavelengthNm) ** k),
  );
  try {
    const { parameters } = weightedLeastSquares(
      design,
      pairs.map((p) => p.x),
      pairs.map((p) => p.xUncertainty ?? 1),
    );
    return (lambda: number) => {
      const u = normalised(lambda);
      return parameters.reduce((sum, a, k) => sum + a * u ** k, 0);
    };
  } catch {
    return null;
  }
}

/** The final models of a recalibration: the previous calibration's family first, a polynomial as fallback. */
function previousFamily(
  previous: CalibrationModel,
  dispersion: DispersionKind,
  n: number,
): FitCalibrationOptions[] {
  // A grating's dispersion is a cubic at most; more freedom only lets noisy end pairs bend it. Beyond a
  // quadratic, three pairs to spare per parameter.
  const highest = Math.max(1, Math.min(dispersion === "prism" ? 5 : 3, n - 4));
  const polynomial: FitCalibrationOptions = {
    model: "polynomial",
    degree: previous.kind === "polynomial" ? Math.min(previous.degree, highest) : highest,
  };
  if (previous.kind === "prism") return [prismRefitOptions(previous), polynomial];
  if (previous.kind === "hartmann") return [{ model: "hartmann" }, polynomial];
  return [polynomial];
}

/** The calibration fitted to the final pairs: a polynomial for a grating; for a prism the physical model
 * (catalogue glasses), else Hartmann, else a polynomial; outliers rejected unless seeds are forced. */
function finalFit(context: PairingContext, pairs: LampPair[]): FitCalibrationResult | null {
  const n = pairs.length;
  const rejectOutliers = context.forced.size === 0;
  const attempts: FitCalibrationOptions[] =
    context.previousModel !== undefined
      ? previousFamily(context.previousModel, context.dispersion, n)
      : context.dispersion === "prism"
        ? [
            { model: "prism" },
            { model: "hartmann" },
            { model: "polynomial", degree: Math.min(5, n - 2) },
          ]
        : [
            { model: "polynomial", degree: n >= 10 ? 3 : n >= 6 ? 2 : 1 },
            { model: "polynomial", degree: 1 },
          ];
  let best: { fit: FitCalibrationResult; aicc: number } | undefined;
  for (const options of attempts) {
    try {
      const fit = fitCalibration(pairs, { ...options, domain: context.domain, rejectOutliers });
      const { aicc } = informationCriteria(
        fit.model.chiSquare,
        fit.model.pairCount,
        fit.model.parameters.length,
      );
      if (!best || aicc < best.aicc) best = { fit, aicc };
      // Over a wide range a strongly dispersing prism defeats Hartmann and polynomials alike (errors of
      // nm at the ends), so the physical model is kept whenever it fits; the others are fallbacks.
      break;
    } catch {
      // Any failed attempt (a CalibrationError, or a singular system from degenerate pairs) only means
      // this model does not fit these pairs; the next attempt, or "needs-manual", follows.
    }
  }
  return best?.fit ?? null;
}

/** Pairs after refinement, before the final calibration fit. */
export interface RefinedPairing {
  pairs: LampPair[];
  /** RMS of the forward fit's residuals, x units. */
  rmsX: number;
  /** Pairs × precision: ranks refinements cheaply before the one final fit. */
  score: number;
}

/** Iterates match → forward fit from the first guess `initialPairs`, tightening the tolerance. */
export function refineLampPairs(context: PairingContext, initialPairs: LampPair[]): RefinedPairing {
  let pairs = initialPairs;
  // Tolerance schedule, in multiples of the final tolerance: wide while the model is crude.
  const schedule = [3, 2, 1.5, 1, 1, 1];
  let rmsX = Infinity;
  for (let stage = 0; stage < schedule.length && pairs.length >= 3; stage++) {
    const degree = Math.max(1, Math.min(stage + 2, 3, pairs.length - 3));
    const predictX = forwardFit(context, pairs, degree);
    if (!predictX) break;
    pairs = matchByPrediction(context, predictX, schedule[stage] * context.toleranceX);
    const check = pairs.length > degree + 1 ? forwardFit(context, pairs, degree) : null;
    rmsX = check
      ? Math.sqrt(
          pairs.reduce((s, p) => s + (p.x - check(p.wavelengthNm)) ** 2, 0) /
            (pairs.length - degree - 1),
        )
      : Infinity;
  }
  const precision = Math.min(Math.max(1 - (2 * rmsX) / context.toleranceX, 0), 1);
  return { pairs, rmsX, score: pairs.length * precision };
}

/** x(λ) of a fitted calibration, by interpolating its λ on a dense grid over the domain. */
function inverseOf(context: PairingContext, fit: FitCalibrationResult): (lambda: number) => number {
  return inverseOfModel(fit.model, context.domain);
}

/** Fits the final calibration to refined pairs, re-matches once with it, and judges the result. */
export function finishLampPairing(
  context: PairingContext,
  refined: RefinedPairing,
): LampPairingResult {
  if (context.dispersion === "prism" && context.previousModel === undefined)
    return finishPrismPairing(context, refined);
  let { pairs } = refined;
  let fit = pairs.length >= 3 ? finalFit(context, pairs) : null;
  if (fit) {
    // The final model (a physical prism, say) can be better than the forward polynomial at the ends,
    // where few lines pinned the latter; one more matching pass with it repairs pairs made there.
    const rematched = matchByPrediction(context, inverseOf(context, fit), context.toleranceX);
    const refit = rematched.length >= 3 ? finalFit(context, rematched) : null;
    if (
      refit &&
      refit.pairs.filter((p) => p.used).length >= fit.pairs.filter((p) => p.used).length
    ) {
      pairs = rematched;
      fit = refit;
    }
  }
  const usedPairs = fit ? pairs.filter((_, i) => fit!.pairs[i].used) : [];
  const forward = usedPairs.length > 5 ? forwardFit(context, usedPairs, 3) : null;
  const rmsX = forward
    ? Math.sqrt(
        usedPairs.reduce((s, p) => s + (p.x - forward(p.wavelengthNm)) ** 2, 0) /
          (usedPairs.length - 4),
      )
    : refined.rmsX;
  return claimSoundEnds(context, withCheckedEnds(context, judge(context, usedPairs, fit, rmsX)));
}

/**
 * A prism's pairs are grown from the refinement's pairs by growLampPairs; only then is the physical
 * model fitted (every catalogue glass, best by AICc, or a glass fitted from the pairs when none fits
 * them: fit-calibration.ts). A glass can fit a wrong pairing well, and the
 * catalogue may not hold the instrument's glass, so the physical model must also beat the glass-free
 * Hartmann form on the same pairs by AICc (both χ² are in x against the peaks' σ); else Hartmann stays.
 */
function finishPrismPairing(context: PairingContext, refined: RefinedPairing): LampPairingResult {
  const pairs = growLampPairs(context, refined.pairs);
  if (pairs.length < 6) return judge(context, [], null, refined.rmsX);
  const rejectOutliers = context.forced.size === 0;
  let forward: ReturnType<typeof fitForwardHartmann> | null = null;
  try {
    forward = fitForwardHartmann(pairs);
  } catch {
    // Any failed attempt (a CalibrationError, or a singular system from degenerate pairs) only means
    // this model does not fit these pairs.
  }
  let fit: FitCalibrationResult | null = null;
  try {
    const prism = fitCalibration(pairs, {
      model: "prism",
      domain: context.domain,
      rejectOutliers: false,
    });
    const prismAicc = informationCriteria(
      prism.model.chiSquare,
      pairs.length,
      prism.model.parameters.length,
    ).aicc;
    const hartmannAicc = forward
      ? informationCriteria(forward.chiSquare, pairs.length, 4).aicc
      : Infinity;
    if (prismAicc <= hartmannAicc && prism.model.kind === "prism") {
      fit = rejectOutliers
        ? fitCalibration(pairs, {
            ...prismRefitOptions(prism.model),
            domain: context.domain,
            rejectOutliers,
          })
        : prism;
    }
  } catch {
    // Any failed attempt (a CalibrationError, or a singular system from degenerate pairs) only means
    // this model does not fit these pairs.
  }
  for (const options of [
    { model: "hartmann" as const },
    { model: "polynomial" as const, degree: Math.min(5, pairs.length - 2) },
  ]) {
    if (fit) break;
    try {
      fit = fitCalibration(pairs, { ...options, domain: context.domain, rejectOutliers });
    } catch {
      // Any failed attempt (a CalibrationError, or a singular system from degenerate pairs) only means
      // this model does not fit these pairs; the next attempt, or "needs-manual", follows.
    }
  }
  if (!fit) return judge(context, [], null, refined.rmsX);
  return judgeFitted(context, pairs, fit);
}

/**
 * A trusted automatic pairing claims its ends only where more than one pair stands behind them: the
 * checks judged the whole pairing; end pairs that carry the calibration alone are then set aside and
 * the covered range ends at the next pair.
 */
function withCheckedEnds(context: PairingContext, result: LampPairingResult): LampPairingResult {
  const fwhmX = typicalPeakFwhm(context.peaks);
  if (result.status !== "paired" || !result.model || context.forced.size > 0 || fwhmX === undefined)
    return result;
  const { pairs, fit, trimmed } = trimPulledEnds(result.pairs, result.model, context.domain, fwhmX);
  if (trimmed.length === 0) return result;
  const setAside = new Set(trimmed.map((p) => p.peakIndex));
  // What is left is a pairing of its own and is checked as one: setting two pairs aside can leave a
  // third beyond a gap that a quintic then follows (seen in the sweep: 8 nm wrong across 130 nm). The
  // pairs set aside were doubtful, so the whole pairing does not stand in for it.
  let kept = { pairs, fit, aside: [] as LampPair[] };
  const verdict = verifyLampPairing(context, pairs, fit);
  if (!verdict.passed) {
    const rest = withoutPairsBeyondGap(context, pairs, verdict);
    if (!rest) {
      const reasons = verdict.checks.filter((c) => !c.passed).map((c) => c.reason);
      return {
        ...result,
        status: "check",
        checks: verdict.checks,
        reasons,
        candidate: fit,
        confidence: Math.min(0.49, result.confidence),
        pairs: [],
        model: null,
        suggestion: pairs,
        unmatchedPeaks: context.peaks.slice(),
        unmatchedLines: context.candidateLines.map((l) => context.lines[l]),
        message:
          `check this pairing: with ${counted(trimmed.length, "end pair")} set aside ` +
          `(${describePairs(trimmed)}), ${reasons.join("; ")}`,
      };
    }
    kept = rest;
  }
  const dropped = [...trimmed, ...kept.aside];
  for (const p of kept.aside) setAside.add(p.peakIndex);
  return {
    ...result,
    pairs: kept.pairs,
    model: kept.fit,
    unmatchedPeaks: [...result.unmatchedPeaks, ...context.peaks.filter((_, i) => setAside.has(i))],
    unmatchedLines: [...result.unmatchedLines, ...dropped.map((p) => context.lines[p.lineIndex])],
    message:
      `${result.message}; ${counted(trimmed.length, "end pair")} set aside ` +
      `(${describePairs(trimmed)}): ` +
      `the calibration there rested on ${trimmed.length > 1 ? "them" : "it"} alone` +
      (kept.aside.length > 0
        ? `; then ${counted(kept.aside.length, "pair")} beyond a wide gap (${describePairs(kept.aside)})`
        : ""),
  };
}

/** Judges a final fit of `pairs`: its used pairs, and its precision in x (residuals through the local dispersion). */
function judgeFitted(
  context: PairingContext,
  pairs: LampPair[],
  fit: FitCalibrationResult,
): LampPairingResult {
  const usedPairs = pairs.filter((_, i) => fit.pairs[i].used);
  const dispersion = modelEvaluation(
    fit.model,
    usedPairs.map((p) => p.x),
  ).dispersion;
  const usedFitted = fit.pairs.filter((p) => p.used);
  const rmsX = Math.sqrt(
    usedFitted.reduce((s, p, i) => s + (p.residualNm / dispersion[i]) ** 2, 0) /
      Math.max(usedFitted.length - fit.model.parameters.length, 1),
  );
  return claimSoundEnds(context, withCheckedEnds(context, judge(context, usedPairs, fit, rmsX)));
}

/**
 * Fits and judges pairs that growth already chose (they are not matched again: a final model
 * extrapolated beyond the pairs would pair strays there). A grating gets its polynomial; a prism the
 * model family with the lowest AICc of the physical prism, Hartmann and a polynomial, since its glass
 * may be outside the catalogue.
 */
export function finishGrownPairing(context: PairingContext, pairs: LampPair[]): LampPairingResult {
  let fit: FitCalibrationResult | null = null;
  if (context.dispersion === "prism") {
    let bestAicc = Infinity;
    const attempts: FitCalibrationOptions[] = [
      { model: "prism" },
      { model: "hartmann" },
      { model: "polynomial", degree: Math.max(1, Math.min(5, pairs.length - 4)) },
    ];
    for (const options of attempts) {
      try {
        const candidate = fitCalibration(pairs, {
          ...options,
          domain: context.domain,
          rejectOutliers: true,
        });
        const used = candidate.pairs.filter((p) => p.used).length;
        // Compared on the same pairs only: a fit that set pairs aside is judged by what it kept, so it must keep them all to compete.
        const { aicc } = informationCriteria(
          candidate.model.chiSquare,
          candidate.model.pairCount,
          candidate.model.parameters.length,
        );
        const penalised = used === pairs.length ? aicc : aicc + 10 * (pairs.length - used);
        if (penalised < bestAicc) [fit, bestAicc] = [candidate, penalised];
      } catch {
        // This family does not fit these pairs; the next one may.
      }
    }
  } else {
    fit = pairs.length >= 3 ? finalFit(context, pairs) : null;
  }
  if (!fit) return judge(context, [], null, Infinity);
  return judgeFitted(context, pairs, fit);
}

/** Refines and finishes in one go. */
export function refineLampPairing(
  context: PairingContext,
  initialPairs: LampPair[],
): LampPairingResult {
  return finishLampPairing(context, refineLampPairs(context, initialPairs));
}

/**
 * Rounds of setting pairs beyond a gap aside: against the rest's shorter span the next pair in can
 * stand beyond a gap of its own (a gap is measured as a share of the span). On the blind sweep (1500
 * instruments, seeds 1000 and 9500000–9900000) three rounds instead of one turned 21 right pairings
 * from "check" into "paired" with the same 10 silent wrongs (fresh seed 10200000, n 300: +3, the
 * same 3).
 */
const MAX_GAP_ROUNDS = 3;

/**
 * Pairs beyond a wide gap at one end decide the calibration there alone, and a shifted cluster of them
 * bends a polynomial onto itself unseen: when `verdict` failed on that, the rest is refitted and, when
 * it passes every check on its own, trusted over the range it covers; when the rest fails on a gap of
 * its own, that is set aside too, up to MAX_GAP_ROUNDS. Null otherwise.
 */
function withoutPairsBeyondGap(
  context: PairingContext,
  pairs: LampPair[],
  verdict: PairingVerdict,
): {
  pairs: LampPair[];
  fit: FitCalibrationResult;
  verdict: PairingVerdict;
  aside: LampPair[];
} | null {
  const aside = new Set<LampPair>();
  let current = { pairs, verdict };
  for (let round = 0; round < MAX_GAP_ROUNDS && current.verdict.beyondGap; round++) {
    for (const p of current.verdict.beyondGap) aside.add(p);
    const rest = refitAndVerify(
      context,
      current.pairs.filter((p) => !aside.has(p)),
    );
    if (!rest) return null;
    if (rest.verdict.passed) return { ...rest, aside: [...aside] };
    current = rest;
  }
  return null;
}

/** `pairs` fitted afresh, the pairs the fit used, and their checks; null when they cannot be fitted. */
function refitAndVerify(
  context: PairingContext,
  pairs: LampPair[],
): { pairs: LampPair[]; fit: FitCalibrationResult; verdict: PairingVerdict } | null {
  const fit = pairs.length >= 3 ? finalFit(context, pairs) : null;
  if (!fit) return null;
  const used = pairs.filter((_, i) => fit.pairs[i].used);
  return { pairs: used, fit, verdict: verifyLampPairing(context, used, fit) };
}

/** "1 pair", "3 end pairs" */
function counted(n: number, noun: string): string {
  return `${n} ${noun}${n === 1 ? "" : "s"}`;
}

/** Below this old-style score the pairs are chance coincidences, not a calibration to check. */
const CHANCE_CONFIDENCE = 0.1;

/** At most this many pairs are dropped on the leave-one-out check before a pairing is reported for checking. */
const MAX_LOO_DROPS = 2;

function judge(
  context: PairingContext,
  givenPairs: LampPair[],
  givenFit: FitCalibrationResult | null,
  rmsX: number,
): LampPairingResult {
  let pairs = givenPairs;
  let fit = givenFit;
  const { peaks, lines, candidateLines } = context;
  let pairedPeaks = new Set(pairs.map((p) => p.peakIndex));
  let pairedLines = new Set(pairs.map((p) => p.lineIndex));
  let confidence = 0;
  if (fit) {
    // Lines the fit puts on the array; as many of the strongest as there are peaks should have been seen.
    const ends = modelEvaluation(fit.model, [context.domain[0], context.domain[1]]).wavelengthNm;
    const [low, high] = [Math.min(ends[0], ends[1]), Math.max(ends[0], ends[1])];
    // Blended lines are left out of pairing on purpose, so neither they nor the peaks they make count
    // against the pairing; the lines' width is the peaks' typical one.
    const xOf = placedOnce(inverseOf(context, fit));
    const fwhmX = typicalPeakFwhm(peaks);
    const blended = (l: number) =>
      fwhmX !== undefined && lampLineBlended(lines, candidateLines, l, xOf, fwhmX);
    const inRange = candidateLines.filter(
      (l) => lines[l].wavelengthNm >= low && lines[l].wavelengthNm <= high,
    );
    const blendedX = inRange.filter(blended).map((l) => xOf(lines[l].wavelengthNm));
    const onArray = inRange
      .filter((l) => !blended(l))
      .sort((a, b) => lines[b].intensity - lines[a].intensity);
    const strongestLines = onArray.slice(0, Math.max(1, Math.min(peaks.length, onArray.length)));
    const lineFraction =
      strongestLines.length > 0
        ? strongestLines.filter((l) => pairedLines.has(l)).length / strongestLines.length
        : 0;
    const strongestPeaks = peaks
      .map((_, i) => i)
      .filter((i) => pairedPeaks.has(i) || !blendedX.some((x) => Math.abs(peaks[i].x - x) < fwhmX!))
      .sort((a, b) => peaks[b].height - peaks[a].height)
      .slice(0, Math.min(10, peaks.length));
    const peakFraction =
      strongestPeaks.length > 0
        ? strongestPeaks.filter((p) => pairedPeaks.has(p)).length / strongestPeaks.length
        : 0;
    const parameters = fit.model.parameters.length;
    const pairFactor = 1 - Math.exp(-Math.max(pairs.length - parameters, 0) / 4);
    const precision = Math.min(Math.max(1 - (2 * rmsX) / context.toleranceX, 0), 1);
    confidence = (0.5 * lineFraction + 0.5 * peakFraction) * pairFactor * precision;
  }
  // An automatic pairing must also pass the checks that a wrong pairing with a small RMS fails; a
  // manual one (forced seeds) is the person's choice and is only fitted.
  let verdict =
    fit && context.forced.size === 0 && pairs.length >= 3
      ? verifyLampPairing(context, pairs, fit)
      : null;
  // A pair that the others put elsewhere (a stray peak next to a missing line; the verdict's outlier) is
  // dropped and the rest refitted and checked again, a few times at most; a pairing that needs more is
  // not trusted.
  let trial = { pairs, fit, verdict };
  for (
    let round = 0;
    round < MAX_LOO_DROPS && trial.verdict && !trial.verdict.passed && trial.verdict.outlier;
    round++
  ) {
    const outlier = trial.verdict.outlier;
    const rest = refitAndVerify(
      context,
      trial.pairs.filter((p) => p !== outlier),
    );
    if (!rest) break;
    trial = rest;
  }
  let beyondGap: LampPair[] = [];
  if (trial.verdict && !trial.verdict.passed) {
    const rest = withoutPairsBeyondGap(context, trial.pairs, trial.verdict);
    if (rest) ({ aside: beyondGap, ...trial } = rest);
  }
  // Only a pairing that passes after the drops replaces the one given; otherwise the given one is reported.
  if (trial.verdict?.passed && trial.pairs !== pairs) {
    ({ pairs, fit, verdict } = trial);
    pairedPeaks = new Set(pairs.map((p) => p.peakIndex));
    pairedLines = new Set(pairs.map((p) => p.lineIndex));
  }
  // Pairs predicted by a previous calibration are no chance coincidences: the checks alone judge them.
  // Likewise a pairing that passed every check: the old score counts unlisted peaks and missing or
  // blended lines against it, which the checks already weigh.
  const coincidence = confidence < CHANCE_CONFIDENCE && !verdict?.passed;
  let status: LampPairingResult["status"];
  if (!fit || coincidence) status = "needs-manual";
  else if (verdict) status = verdict.passed ? "paired" : "check";
  else status = confidence >= context.minConfidence ? "paired" : "needs-manual";
  if (verdict) {
    // Unlisted lamp lines and missing ones lower the old score without saying anything against the
    // pairing; the checks' margin is what separates right from wrong (see PAIRING_CHECK_LIMITS).
    confidence = verdict.passed ? 0.5 + 0.5 * verdict.margin : Math.min(0.49, 0.5 * confidence);
  }
  const reasons = verdict ? verdict.checks.filter((c) => !c.passed).map((c) => c.reason) : [];
  const paired = status === "paired";
  const unmatchedPeaks = paired ? peaks.filter((_, i) => !pairedPeaks.has(i)) : peaks.slice();
  const unmatchedLines = candidateLines
    .filter((l) => !paired || !pairedLines.has(l))
    .map((l) => lines[l]);
  return {
    status,
    ...(verdict ? { checks: verdict.checks } : {}),
    reasons,
    candidate: status === "check" ? fit : null,
    confidence,
    pairs: paired ? pairs : [],
    model: paired ? fit : null,
    suggestion: pairs,
    unmatchedPeaks,
    unmatchedLines,
    message: paired
      ? `paired ${pairs.length} of ${peaks.length} peaks (confidence ${confidence.toFixed(2)}, RMS ${fit!.rmsNm.toFixed(4)} nm)` +
        (beyondGap.length > 0
          ? `; ${counted(beyondGap.length, "pair")} beyond a wide gap set aside (${describePairs(beyondGap)}): ` +
            `the calibration there would have rested on ${beyondGap.length > 1 ? "them" : "it"} alone`
          : "")
      : status === "check"
        ? `check this pairing: ${reasons.join("; ")}`
        : `no trustworthy pairing (confidence ${confidence.toFixed(2)} < ${context.minConfidence}): ` +
          `pair two or three peaks by hand and extend from there`,
  };
}
