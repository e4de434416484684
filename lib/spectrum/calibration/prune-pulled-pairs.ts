// The last step before a grown pairing is fitted: pairs whose peak sits measurably off the smooth
// curve of the others are set aside. Such a peak is most often a blend with a line the table does not
// list (a real lamp shows many), its centre pulled by a fraction of a line width; a handful of them
// bias a cubic by more than a tenth of the resolution at the ends of the covered range, with a small
// RMS, while the well-centred lines follow the curve to a few hundredths of a pixel.
import { upperMedianOfSorted } from "../statistics/upper-median";
import type { DispersionKind } from "../types";
import { growthDegree } from "./growth-degree";
import type { LampPair } from "./lamp-pairing-types";
import { fitStraightenedPolynomial } from "./straightened-polynomial";

export interface PrunePulledPairsOptions {
  /**
   * A pair is set aside beyond this many robust σ of the residuals…
   * @default 3
   */
  sigmaLimit?: number;
  /**
   * …and beyond this floor, x units (centring noise alone never reaches it).
   * @default 0.15
   */
  floorX?: number;
  /**
   * At most this share of the pairs is set aside; a pairing that needs more is no smooth curve at all.
   * @default 0.3
   */
  maxShare?: number;
}

/** The pair farthest from a model of all the pairs (its degree as growth would choose it), with the residuals' robust σ (1.4826 × median |residual|). */
export function worstOffCurve(
  pairs: readonly LampPair[],
  straighten: (wavelengthNm: number) => number,
  gRange: [number, number],
  dispersion: DispersionKind,
  domain: [number, number],
): { index: number; residualX: number; robustSigmaX: number } | null {
  const xs = pairs.map((p) => p.x);
  const covered = (Math.max(...xs) - Math.min(...xs)) / (domain[1] - domain[0]);
  const model = fitStraightenedPolynomial(
    pairs,
    straighten,
    gRange,
    Math.max(1, growthDegree(pairs.length, covered, dispersion)),
  );
  if (!model) return null;
  const residuals = pairs.map((p) => Math.abs(p.x - model.predictX(p.wavelengthNm)));
  const sorted = residuals.slice().sort((a, b) => a - b);
  const residualX = sorted[sorted.length - 1];
  return {
    index: residuals.indexOf(residualX),
    residualX,
    robustSigmaX: 1.4826 * upperMedianOfSorted(sorted),
  };
}

/** The pairs left after setting aside those pulled off the smooth curve of the rest (worst first, one at a time). */
export function prunePulledPairs(
  pairs: readonly LampPair[],
  straighten: (wavelengthNm: number) => number,
  gRange: [number, number],
  dispersion: DispersionKind,
  domain: [number, number],
  options: PrunePulledPairsOptions = {},
): LampPair[] {
  const { sigmaLimit = 3, floorX = 0.15, maxShare = 0.3 } = options;
  let kept = pairs.slice();
  const most = Math.floor(maxShare * pairs.length);
  while (kept.length > 8 && pairs.length - kept.length < most) {
    const worst = worstOffCurve(kept, straighten, gRange, dispersion, domain);
    if (!worst || !(worst.residualX > Math.max(sigmaLimit * worst.robustSigmaX, floorX))) break;
    kept = kept.filter((_, k) => k !== worst.index);
  }
  return kept;
}
