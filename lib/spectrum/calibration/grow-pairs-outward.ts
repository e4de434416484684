// Grows a few sure lamp pairs (a short stretch of the array) into a pairing of the whole array, one
// line at a time, nearest the paired stretch first, with a model that bends as its support widens:
// a straight line over a short stretch, a quadratic and then a cubic (a prism in its straightened axis:
// up to a quintic) as the pairs cover more. Each line is accepted only when exactly one free peak
// stands inside its prediction window, no other lamp line could have made that peak, and the peak is
// about as strong as the line should make it. A curved grating or a prism is crossed this way because
// each step extrapolates only a little beyond what is already pinned.
import type { DispersionKind } from "../types";
import type { LampLine, LampPair, LampPeak } from "./lamp-pairing-types";
import { lowerBound } from "../matching/lower-bound";
import { elementOfSpecies } from "./element-of-species";
import { heightInBand, lampHeightBand } from "./lamp-height-band";
import { growthDegree } from "./growth-degree";
import { worstOffCurve } from "./prune-pulled-pairs";
import { landingCloseness } from "./landing-closeness";
import { toLampPair } from "./to-lamp-pair";
import { fitStraightenedPolynomial, type StraightenedPolynomial } from "./straightened-polynomial";

export interface GrowPairsOutwardInput {
  peaks: readonly LampPeak[];
  lines: readonly LampLine[];
  /** Indices of the lines that may be paired. */
  candidateLines: readonly number[];
  /** Indices of the peaks that may be paired (hot pixels left out). */
  usablePeaks: readonly number[];
  dispersion: DispersionKind;
  domain: [number, number];
  /** Matching half-width in x (half a resolution element). */
  toleranceX: number;
  /** g(λ) in which the dispersion is nearly straight. */
  straighten: (wavelengthNm: number) => number;
  /** g at the nominal range's ends: the polynomial's variable runs from −1 to 1 between them. */
  gRange: [number, number];
  /** The stated nominal range, nm: a leap must keep it near the array's ends. */
  nominalRangeNm: [number, number];
}

export interface GrowPairsOutwardOptions {
  /**
   * A stretch is extended by at most this share of the array per step, or half the paired stretch if more.
   * @default 0.06
   */
  minReach?: number;
  /**
   * Half-width of a prediction window in statistical σ (on top of the matching tolerance and the
   * model-form allowance).
   * @default 3
   */
  windowSigma?: number;
  /**
   * Largest window, in matching tolerances: a line whose position is less certain than that waits for
   * more pairs.
   * @default 6
   */
  maxWindowTolerances?: number;
  /**
   * A peak may be this many times stronger or fainter than the line's intensity predicts from the pairs
   * so far (their median height-to-intensity ratio), or 3 robust σ of that ratio if wider. Table
   * intensities, lamps and detector responses disagree by a factor of a few (common practice).
   * @default 12
   */
  heightTolerance?: number;
}

/** Widest window, in matching tolerances, in which a line beyond the paired stretch is paired on its own. */
const SINGLE_STEP_WINDOW = 1.5;

/** How far, as a share of the array, a leap may put the stated range's ends from the array's ends. */
const STATED_RANGE_SHARE = 0.1;

/** Least support (close-landing lines besides the anchor) of a leap that keeps the stated range. */
const LEAP_MIN_SUPPORT = 1.5;

/** How far (in close-landing lines) the best leap must lead every trial that pairs differently. */
const LEAP_LEAD = 1.5;

/**
 * How far a model of `degree` fitted over a stretch may be off at `distanceX` beyond it, in x: the
 * neglected next term of a curved grating's dispersion (a second derivative of up to ~0.6 and a third
 * of up to ~0.3 of the span over the array, normalised; common practice for spectrograph designs, and
 * the sweep's generator) or of a prism's straightened one (which depends on the glass: looser).
 */
function formAllowanceX(
  distanceX: number,
  spanX: number,
  degree: number,
  dispersion: DispersionKind,
): number {
  const r = distanceX / spanX;
  const loose = dispersion === "prism" ? 2 : 1;
  if (degree <= 1) return loose * 0.35 * r * r * spanX;
  if (degree === 2) return loose * 0.08 * r * r * r * spanX;
  return loose * 0.03 * r * r * r * spanX;
}

/** Grows `seed` outward; returns the pairs sorted by x. */
export function growPairsOutward(
  input: GrowPairsOutwardInput,
  seed: readonly LampPair[],
  options: GrowPairsOutwardOptions = {},
): LampPair[] {
  const {
    minReach = 0.06,
    windowSigma = 3,
    maxWindowTolerances = 6,
    heightTolerance = 12,
  } = options;
  const {
    peaks,
    lines,
    candidateLines,
    usablePeaks,
    dispersion,
    domain,
    toleranceX,
    straighten,
    gRange,
  } = input;
  const spanX = domain[1] - domain[0];
  let pairs = seed.slice();
  const pairedPeaks = new Set(pairs.map((p) => p.peakIndex));
  const pairedLines = new Set(pairs.map((p) => p.lineIndex));
  // A line turned down waits until three more pairs have tightened the model.
  const turnedDownAt = new Map<number, number>();
  const usableByX = usablePeaks.slice().sort((a, b) => peaks[a].x - peaks[b].x);
  const usableX = usableByX.map((p) => peaks[p].x);
  const freePeaksWithin = (from: number, to: number): number[] => {
    const found: number[] = [];
    for (let k = lowerBound(usableX, from); k < usableX.length && usableX[k] <= to; k++) {
      if (!pairedPeaks.has(usableByX[k])) found.push(usableByX[k]);
    }
    return found;
  };
  const heightBand = () => lampHeightBand(pairs, peaks, lines, heightTolerance);
  const elementOf = (line: number) => elementOfSpecies(lines[line].species);

  extend();
  prune();
  turnedDownAt.clear();
  extend();
  prune();
  return pairs.sort((a, b) => a.x - b.x);

  /** Adds lines one at a time, nearest the paired stretch first, refitting after each. */
  function extend(): void {
    for (let step = 0; step < 4 * candidateLines.length + 8; step++) {
      const xs = pairs.map((p) => p.x);
      const covered: [number, number] = [Math.min(...xs), Math.max(...xs)];
      const coveredFraction = (covered[1] - covered[0]) / spanX;
      const degree = growthDegree(pairs.length, coveredFraction, dispersion);
      if (degree < 1) break;
      const model = fitStraightenedPolynomial(pairs, straighten, gRange, degree);
      if (!model) break;
      // With pairs to spare, the next degree up measures the model-form error directly.
      const next =
        pairs.length >= degree + 5 && coveredFraction >= 0.25
          ? fitStraightenedPolynomial(pairs, straighten, gRange, degree + 1)
          : null;
      const reach = Math.max(minReach * spanX, 0.5 * (covered[1] - covered[0]));
      let chosen: { line: number; x: number; distance: number } | undefined;
      for (const line of candidateLines) {
        if (pairedLines.has(line)) continue;
        const waitedSince = turnedDownAt.get(line);
        if (waitedSince !== undefined && pairs.length < waitedSince + 3) continue;
        const x = model.predictX(lines[line].wavelengthNm);
        if (!(x >= domain[0] - toleranceX && x <= domain[1] + toleranceX)) continue;
        const distance = Math.max(0, covered[0] - x, x - covered[1]);
        if (distance > reach) continue;
        if (
          !chosen ||
          distance < chosen.distance ||
          (distance === chosen.distance && lines[line].intensity > lines[chosen.line].intensity)
        ) {
          chosen = { line, x, distance };
        }
      }
      // A step beyond the paired stretch whose window is wider than a tolerance could take a stray peak
      // for a missing line and bend every later step: such ground is crossed by a supported leap instead.
      const window = chosen
        ? predictionWindow(model, next, chosen.line, chosen.distance)
        : Infinity;
      const wide =
        chosen !== undefined && chosen.distance > 0 && window > SINGLE_STEP_WINDOW * toleranceX;
      if (!chosen || wide) {
        if (leap(model, covered)) continue;
        break;
      }
      const accepted =
        window <= maxWindowTolerances * toleranceX &&
        acceptable(model, chosen.line, chosen.x, window);
      if (accepted === false) {
        turnedDownAt.set(chosen.line, pairs.length);
        continue;
      }
      const peak = accepted;
      pairs = [...pairs, pairOf(peak, chosen.line)];
      pairedPeaks.add(peak);
      pairedLines.add(chosen.line);
    }
  }

  /**
   * Crosses ground beyond the paired stretch that single steps cannot: each of the nearest strong
   * lines beyond it is tried with every plausible peak in its (wide) window, and so is the model as it
   * stands (the line may be missing); each trial is scored by the other lines beyond the stretch that
   * then land alone on a peak, each counted by how close it lands. The best trial is taken, with its
   * support, when its support is at least two and clearly ahead of every trial that pairs differently.
   * Returns whether pairs were added.
   */
  function leap(model: StraightenedPolynomial, covered: [number, number]): boolean {
    const band = heightBand();
    const beyond = candidateLines
      .filter((line) => !pairedLines.has(line) && turnedDownAt.get(line) !== Infinity)
      .map((line) => ({ line, x: model.predictX(lines[line].wavelengthNm) }))
      .filter((c) => c.x >= domain[0] && c.x <= domain[1] && (c.x < covered[0] || c.x > covered[1]))
      .map((c) => ({
        ...c,
        distance: Math.max(covered[0] - c.x, c.x - covered[1]),
        side: c.x < covered[0] ? -1 : 1,
      }));
    type Trial = { pairs: LampPair[]; support: number };
    const trials: Trial[] = [];
    const supportOf = (
      trialModel: StraightenedPolynomial,
      onSide: typeof beyond,
      within: number,
      taken: LampPair[],
    ): Trial => {
      const used = new Set(taken.map((p) => p.peakIndex));
      const found: LampPair[] = [...taken];
      let support = 0;
      for (const other of onSide) {
        if (other.distance > within || taken.some((p) => p.lineIndex === other.line)) continue;
        const x = trialModel.predictX(lines[other.line].wavelengthNm);
        const near = freePeaksWithin(x - toleranceX, x + toleranceX).filter((p) => !used.has(p));
        if (near.length !== 1 || !plausibleHeight(other.line, near[0], band)) continue;
        // Where lines crowd (a prism's red end), another line that lands on the same peak makes it no support.
        const crowded = onSide.some(
          (rival) =>
            rival.line !== other.line &&
            Math.abs(trialModel.predictX(lines[rival.line].wavelengthNm) - peaks[near[0]].x) <=
              2 * toleranceX,
        );
        if (crowded) continue;
        used.add(near[0]);
        found.push(pairOf(near[0], other.line));
        support += landingCloseness(peaks[near[0]].x - x, toleranceX);
      }
      // A long leap's trial model is rough where it lands: right lines land a good part of a tolerance
      // off it. Refitted with what landed, right lines sit on the curve and chance ones do not; each
      // landed line counts by the better of the two closenesses.
      const landed = found.length - taken.length;
      if (landed >= 2) {
        const all = [...pairs, ...found];
        const refit = fitStraightenedPolynomial(
          all,
          straighten,
          gRange,
          Math.min(3, all.length - 3),
        );
        if (refit) {
          let refitSupport = 0;
          for (const p of found.slice(taken.length)) {
            refitSupport += landingCloseness(p.x - refit.predictX(p.wavelengthNm), toleranceX);
          }
          support = Math.max(support, refitSupport);
        }
      }
      return { pairs: found, support };
    };
    for (const side of [-1, 1]) {
      const onSide = beyond.filter((c) => c.side === side).sort((a, b) => a.distance - b.distance);
      if (onSide.length === 0) continue;
      const anchors = onSide
        .slice(0, 12)
        .sort((a, b) => lines[b.line].intensity - lines[a.line].intensity)
        .slice(0, 6);
      const farthest = Math.max(...anchors.map((a) => a.distance));
      const within = farthest + 0.5 * Math.max(farthest, minReach * spanX);
      if (keepsStatedRange(model)) trials.push(supportOf(model, onSide, within, []));
      for (const anchor of anchors) {
        const window = Math.min(
          toleranceX +
            windowSigma * model.sigmaX(lines[anchor.line].wavelengthNm) +
            formAllowanceX(anchor.distance, spanX, model.degree, dispersion),
          0.2 * spanX,
        );
        for (const peak of freePeaksWithin(anchor.x - window, anchor.x + window)) {
          if (!plausibleHeight(anchor.line, peak, band)) continue;
          const trial = [...pairs, pairOf(peak, anchor.line)];
          const trialModel = fitStraightenedPolynomial(
            trial,
            straighten,
            gRange,
            Math.min(model.degree + 1, 3, trial.length - 2),
          );
          if (trialModel)
            trials.push(supportOf(trialModel, onSide, within, [pairOf(peak, anchor.line)]));
        }
      }
    }
    trials.sort((a, b) => b.support - a.support);
    const first = trials[0];
    if (!first || first.support < LEAP_MIN_SUPPORT) return false;
    // A trial that pairs a line with another peak (or a peak with another line) with nearly as much
    // support leaves the leap undecided; one that only adds or lacks pairs agrees with it.
    const peakOfLine = new Map(first.pairs.map((p) => [p.lineIndex, p.peakIndex]));
    const lineOfPeak = new Map(first.pairs.map((p) => [p.peakIndex, p.lineIndex]));
    const conflicts = (t: Trial) =>
      t.pairs.some(
        (p) =>
          (peakOfLine.has(p.lineIndex) && peakOfLine.get(p.lineIndex) !== p.peakIndex) ||
          (lineOfPeak.has(p.peakIndex) && lineOfPeak.get(p.peakIndex) !== p.lineIndex),
      );
    const runnerUp = trials.slice(1).find(conflicts);
    if (runnerUp && runnerUp.support > first.support - LEAP_LEAD) return false;
    for (const pair of first.pairs) {
      if (pairedPeaks.has(pair.peakIndex) || pairedLines.has(pair.lineIndex)) continue;
      pairs = [...pairs, pair];
      pairedPeaks.add(pair.peakIndex);
      pairedLines.add(pair.lineIndex);
    }
    return first.pairs.length > 0;
  }

  /**
   * Whether a model puts the stated range's ends near the array's ends (either way round): the stated
   * range is off by a few per cent of the span at most (±3 % in the sweep, common practice for a
   * spectrometer's data sheet), and a curved grating's bending moves them a few per cent more.
   */
  function keepsStatedRange(model: StraightenedPolynomial): boolean {
    const reach = STATED_RANGE_SHARE * spanX;
    const low = model.predictX(input.nominalRangeNm[0]);
    const high = model.predictX(input.nominalRangeNm[1]);
    const near = (x: number, end: number) => Math.abs(x - end) <= reach;
    return (
      (near(low, domain[0]) && near(high, domain[1])) ||
      (near(low, domain[1]) && near(high, domain[0]))
    );
  }

  function plausibleHeight(line: number, peak: number, band: [number, number]): boolean {
    return heightInBand(peaks[peak].height, lines[line].intensity, band);
  }

  function pairOf(peak: number, line: number): LampPair {
    return toLampPair(input, peak, line);
  }

  /**
   * Drops, one at a time, the pair farthest from a model of all pairs while it is farther than four
   * robust σ of the residuals (and than half a tolerance): a stray peak taken for a missing line sits
   * anywhere in its window, the right pairs within a tenth of a pixel or so of a smooth curve.
   */
  function prune(): void {
    while (pairs.length > 6) {
      const worst = worstOffCurve(pairs, straighten, gRange, dispersion, domain);
      if (!worst || !(worst.residualX > Math.max(4 * worst.robustSigmaX, 0.5 * toleranceX))) return;
      pairedPeaks.delete(pairs[worst.index].peakIndex);
      pairedLines.delete(pairs[worst.index].lineIndex);
      turnedDownAt.set(pairs[worst.index].lineIndex, Infinity);
      pairs = pairs.filter((_, k) => k !== worst.index);
    }
  }

  function predictionWindow(
    model: StraightenedPolynomial,
    next: StraightenedPolynomial | null,
    line: number,
    distance: number,
  ): number {
    const lambda = lines[line].wavelengthNm;
    const form = next
      ? Math.abs(next.predictX(lambda) - model.predictX(lambda))
      : formAllowanceX(distance, spanX, model.degree, dispersion);
    // Once enough pairs show how closely they follow the model, the window shrinks towards their scatter.
    const floor =
      model.degree >= 2 && pairs.length >= 8
        ? Math.max(0.4 * toleranceX, 4 * model.rmsX)
        : toleranceX;
    return Math.min(toleranceX, floor) + windowSigma * model.sigmaX(lambda) + form;
  }

  /** The one peak `line` may take, or false. */
  function acceptable(
    model: StraightenedPolynomial,
    line: number,
    predicted: number,
    window: number,
  ): number | false {
    const inWindow = freePeaksWithin(predicted - window, predicted + window);
    if (inWindow.length !== 1) return false;
    const peak = inWindow[0];
    if (!plausibleHeight(line, peak, heightBand())) return false;
    const { intensity } = lines[line];
    // Another line that could have made this peak (inside the window of it, or blended with the line)
    // leaves the pair undecidable; a line of the same gas far weaker than this one is no rival.
    for (const rival of candidateLines) {
      if (rival === line) continue;
      const sameElement = elementOf(rival) === elementOf(line);
      if (sameElement && lines[rival].intensity < 0.05 * intensity) continue;
      const rivalX = model.predictX(lines[rival].wavelengthNm);
      const reachX = Math.max(window, 1.5 * 2 * toleranceX);
      if (Math.abs(rivalX - predicted) <= reachX && !pairedLines.has(rival)) return false;
      if (Math.abs(rivalX - peaks[peak].x) <= window && !pairedLines.has(rival)) return false;
    }
    return peak;
  }
}
