// First pairs of a recalibration: the instrument's previous calibration, moved by a small shift and
// stretch (a day's drift: temperature, a knock), predicts where each lamp line lands; the transform
// that puts the most lamp lines on peaks wins, and its matches seed the usual refinement.
import type { CalibrationModel } from "./calibration-model";
import type { LampPair } from "./lamp-pairing-types";
import { inverseOfModel } from "./inverse-of-model";
import type { PairingContext } from "./pairing-context";
import { lampLineBlended } from "./lamp-line-blended";
import { toLampPair } from "./to-lamp-pair";
import { typicalPeakFwhm } from "./typical-peak-fwhm";
import { weightedLeastSquares } from "./weighted-least-squares";
import { lowerBound } from "../matching/lower-bound";
import { upperMedian } from "../statistics/upper-median";

export interface PairsFromPreviousOptions {
  /** Largest shift searched, as a fraction of the array. @default 0.03 */
  maxShiftFraction?: number;
  /** Largest relative stretch searched about the array's middle. @default 0.01 */
  maxStretch?: number;
}

/** The lamp pairs the best shifted and stretched previous calibration makes; empty when it cannot be used. */
export function pairsFromPrevious(
  context: PairingContext,
  previous: CalibrationModel,
  options: PairsFromPreviousOptions = {},
): LampPair[] {
  const { maxShiftFraction = 0.03, maxStretch = 0.01 } = options;
  const [xMin, xMax] = context.domain;
  let xOf: (lambda: number) => number;
  try {
    xOf = inverseOfModel(previous, context.domain);
  } catch {
    return [];
  }
  const { peaks, lines, candidateLines, toleranceX } = context;
  const predicted = candidateLines
    .map((l) => ({ line: l, x: xOf(lines[l].wavelengthNm) }))
    .filter((c) => Number.isFinite(c.x));
  if (predicted.length === 0 || peaks.length === 0) return [];
  const order = peaks.map((_, i) => i).sort((a, b) => peaks[a].x - peaks[b].x);
  const sortedX = order.map((i) => peaks[i].x);
  const nearest = (x: number): number => {
    const low = lowerBound(sortedX, x);
    const candidates = [low - 1, low].filter((k) => k >= 0 && k < sortedX.length);
    return candidates.reduce(
      (best, k) => (Math.abs(sortedX[k] - x) < Math.abs(sortedX[best] - x) ? k : best),
      candidates[0],
    );
  };
  const middle = 0.5 * (xMin + xMax);
  const span = xMax - xMin;
  const maxShift = maxShiftFraction * span;
  const shiftStep = 0.5 * toleranceX;
  const stretchSteps = 7;
  // Strong lines count more: a chance coincidence with a faint line is cheap, with a strong one rare.
  const weight = (l: number) => 1 + Math.log1p(Math.max(lines[l].intensity, 0));
  let best = { score: -1, shift: 0, stretch: 1 };
  for (let s = 0; s < stretchSteps; s++) {
    const stretch = 1 + maxStretch * ((2 * s) / (stretchSteps - 1) - 1);
    for (let shift = -maxShift; shift <= maxShift; shift += shiftStep) {
      let score = 0;
      for (const { line, x } of predicted) {
        const moved = middle + (x - middle) * stretch + shift;
        const k = nearest(moved);
        if (Math.abs(sortedX[k] - moved) <= toleranceX) score += weight(line);
      }
      if (score > best.score) best = { score, shift, stretch };
    }
  }
  // Refinement: the day's drift maps yesterday's pixel of a line to today's smoothly, so a quadratic
  // in yesterday's pixel, fitted to the matches, predicts every line; matching with it again at a
  // tightening window recovers the lines the coarse search missed and drops chance neighbours.
  let mapX = (u: number) => middle + (u - middle) * best.stretch + best.shift;
  let pairs: LampPair[] = [];
  const fwhmX = typicalPeakFwhm(peaks);
  // The last windows are tight: a true line's peak sits within a fraction of the half-width of where
  // the drift map puts it; an unlisted neighbour further off is not taken for it.
  for (const window of [2, 1.5, 1, 0.6, 0.6]) {
    const byPeak = new Map<number, { line: number; distance: number }>();
    const predictX = (lambda: number) => mapX(xOf(lambda));
    for (const { line, x } of predicted) {
      const moved = mapX(x);
      const k = nearest(moved);
      const distance = Math.abs(sortedX[k] - moved);
      if (distance > window * toleranceX) continue;
      // A line blended with a neighbour into one peak is left out: the peak's centre belongs to neither.
      if (fwhmX !== undefined && lampLineBlended(lines, candidateLines, line, predictX, fwhmX))
        continue;
      const current = byPeak.get(order[k]);
      if (!current || distance < current.distance) byPeak.set(order[k], { line, distance });
    }
    pairs = [...byPeak].map(([peak, { line }]) => toLampPair(context, peak, line));
    if (pairs.length < 6) break;
    // Pairs far off the current map (a stray peak next to a missing line) do not steer the next one.
    const offsets = pairs.map((p) => Math.abs(p.x - predictX(p.wavelengthNm)));
    const spread = 1.4826 * upperMedian(offsets);
    const steering = pairs.filter((_, i) => offsets[i] <= Math.max(3 * spread, 0.25 * toleranceX));
    if (steering.length < 6) break;
    const us = steering.map((p) => xOf(lines[p.lineIndex].wavelengthNm));
    const scale = 0.5 * span;
    const design = us.map((u) => [1, (u - middle) / scale, ((u - middle) / scale) ** 2]);
    try {
      const { parameters } = weightedLeastSquares(
        design,
        steering.map((p) => p.x),
        steering.map(() => 1),
      );
      const [c0, c1, c2] = parameters;
      mapX = (u: number) => {
        const t = (u - middle) / scale;
        return c0 + c1 * t + c2 * t * t;
      };
    } catch {
      break;
    }
  }
  return pairs.sort((a, b) => a.x - b.x);
}
