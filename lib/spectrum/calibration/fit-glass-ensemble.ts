// The physical prism model fitted for every catalogue glass at once, for pairing a prism: the glasses
// that fit the pairs about equally well (ΔAICc small) are kept, and their spread of predicted pixels is
// the model-form uncertainty of a prediction. Where the pairs pin the glass the spread is a fraction of a
// pixel even far outside them (the right glass extrapolates as well as it interpolates); where they do
// not, the glasses part by many pixels and a line there is not matched until more pairs decide.
import { fitForwardPrism, type ForwardPrismFit } from "./fit-forward-prism";
import type { ForwardHartmannPoint } from "./fit-forward-hartmann";
import { GLASS_NAMES, type GlassName } from "./glass-catalogue";
import { glassesValidOver } from "./glasses-valid-over";
import { informationCriteria } from "./information-criteria";

export interface FitGlassEnsembleOptions {
  /**
   * Glasses within this AICc of the best are kept (ΔAICc ≤ 4: "considerably less support" begins
   * beyond it, after Burnham & Anderson; common practice).
   * @default 4
   */
  maxDeltaAicc?: number;
  /**
   * Apex angle of the prism, degrees.
   * @default 60
   */
  apexDeg?: number;
  /**
   * Fit the camera axis angle of each glass's prism (see fitForwardPrism).
   * @default true
   */
  fitAxisAngle?: boolean;
  /**
   * Glasses to try.
   * @default every catalogue glass
   */
  glasses?: readonly GlassName[];
  /**
   * Each glass's incidence from an earlier fit of nearly the same pairs (read to start each glass's
   * search there, and updated with this fit's).
   * @default undefined (every glass searched from scratch)
   */
  incidenceStarts?: Map<GlassName, number>;
  /**
   * Each glass's χ² over a subset of the points, fitted with the same settings and the same reference
   * wavelength (the middle of the points' range: with the camera axis pinned to the reference ray, a
   * fit of another range is another model). Adding pairs to one model never lowers its least-squares
   * minimum, so a glass whose floor already lies beyond maxDeltaAicc of the best glass fitted is left
   * out without a fit (as far as each fit finds its glass's least χ², which a search from the glass's
   * last incidence does on nearly the same pairs). The floor's AICc is taken with the fewest
   * parameters a fit can have, which keeps it below the fit's own.
   * @default undefined (every glass fitted)
   */
  chiSquareFloors?: ReadonlyMap<GlassName, number>;
}

/** The kept glasses and what they say together. */
export interface GlassEnsemble {
  /** The kept fits, best (lowest AICc) first. */
  fits: ForwardPrismFit[];
  /** AICc of the best glass (χ² against the pairs' x σ; k = 4, or 3 without the axis angle). */
  bestAicc: number;
  /** Akaike-weighted mean of the kept glasses' x at λ; NaN where one has no prediction. */
  predictX: (wavelengthNm: number) => number;
  /** Largest minus smallest x the kept glasses predict at λ. */
  spreadX: (wavelengthNm: number) => number;
  /** The best glass's prediction σ combined in quadrature with the spread. */
  predictionSigmaX: (wavelengthNm: number, peakSigmaX?: number) => number;
  /**
   * Each glass's χ² over these points, or for a glass left out, the floor it was left out at: floors
   * for any fit of more pairs (see chiSquareFloors).
   */
  chiSquares: Map<GlassName, number>;
}

/** Fits every glass to `points` and keeps the well-supported ones; null when no glass fits at all. */
export function fitGlassEnsemble(
  points: readonly ForwardHartmannPoint[],
  options: FitGlassEnsembleOptions = {},
): GlassEnsemble | null {
  const { maxDeltaAicc = 4, apexDeg = 60, fitAxisAngle = true, glasses = GLASS_NAMES } = options;
  if (!(maxDeltaAicc >= 0)) throw new RangeError(`maxDeltaAicc must be ≥ 0, got ${maxDeltaAicc}`);
  const scored: { fit: ForwardPrismFit; aicc: number; order: number }[] = [];
  const wavelengths = points.map((p) => p.wavelengthNm);
  const starts = options.incidenceStarts;
  const floors = options.chiSquareFloors;
  const chiSquares = new Map<GlassName, number>();
  const floorOf = (glass: GlassName) => floors?.get(glass) ?? 0;
  // A fit without the axis angle, or whose axis angle did not lower χ², has three parameters.
  const fewestParameters = 3;
  // The most promising first, so that the best is known before a glass's floor is weighed against it.
  const candidates = glassesValidOver([Math.min(...wavelengths), Math.max(...wavelengths)], glasses)
    .map((glass, order) => ({ glass, order, floor: floorOf(glass) }))
    .sort((a, b) => a.floor - b.floor || a.order - b.order);
  let bestSoFar = Infinity;
  for (const { glass, order, floor } of candidates) {
    if (
      floor > 0 &&
      informationCriteria(floor, points.length, fewestParameters).aicc - bestSoFar > maxDeltaAicc
    ) {
      chiSquares.set(glass, floor);
      continue;
    }
    try {
      const fit = fitForwardPrism(points, glass, {
        apexDeg,
        fitAxisAngle,
        ...(starts?.has(glass) ? { startIncidenceRad: starts.get(glass) } : {}),
      });
      starts?.set(glass, fit.parameters[0]);
      chiSquares.set(glass, fit.chiSquare);
      const { aicc } = informationCriteria(fit.chiSquare, points.length, fit.parameters.length);
      if (Number.isFinite(aicc)) {
        scored.push({ fit, aicc, order });
        bestSoFar = Math.min(bestSoFar, aicc);
      }
    } catch {
      // A glass whose formula does not reach a pair's wavelength, or passes no ray, is simply not a candidate.
    }
  }
  // Equals keep the catalogue's order, whichever was fitted first.
  scored.sort((a, b) => a.aicc - b.aicc || a.order - b.order);
  // A glass whose pairs do not determine its parameters is no candidate; only the best and those
  // within reach of it are asked (each asking works out a covariance).
  const kept: typeof scored = [];
  for (const s of scored) {
    if (kept.length > 0 && s.aicc - kept[0].aicc > maxDeltaAicc) break;
    if (s.fit.determined()) kept.push(s);
  }
  if (kept.length === 0) return null;
  const bestAicc = kept[0].aicc;
  const weights = kept.map((s) => Math.exp(-(s.aicc - bestAicc) / 2));
  const totalWeight = weights.reduce((sum, w) => sum + w, 0);
  const predictions = (wavelengthNm: number) => kept.map((s) => s.fit.predictX(wavelengthNm));
  const spreadX = (wavelengthNm: number) => {
    const values = predictions(wavelengthNm);
    return Math.max(...values) - Math.min(...values);
  };
  return {
    fits: kept.map((s) => s.fit),
    bestAicc,
    predictX: (wavelengthNm) =>
      predictions(wavelengthNm).reduce((sum, x, i) => sum + weights[i] * x, 0) / totalWeight,
    spreadX,
    predictionSigmaX: (wavelengthNm, peakSigmaX) =>
      Math.hypot(kept[0].fit.predictionSigmaX(wavelengthNm, peakSigmaX), spreadX(wavelengthNm)),
    chiSquares,
  };
}
