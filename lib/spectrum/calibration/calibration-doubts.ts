// Why a fitted calibration should not silently become an instrument's default: too few pairs, pairs that
// cover too little of the array, ends that rest on one or two isolated pairs, or an automatic pairing of
// low confidence. Each doubt is a sentence a chemist can act on; an empty list means no doubt.

import { MIN_TRUSTED_PAIRS } from "./min-trusted-pairs";

/** The parts of a fit the doubts look at (a FitCalibrationResult has them all). */
export interface CalibrationDoubtsFit {
  /** Every pair of the fit; only those with `used` count. */
  pairs: readonly { x: number; wavelengthNm: number; used: boolean }[];
  model: {
    /** The array's full extent on the input axis. */
    domain: readonly [number, number];
    /** Extent of the used pairs on the input axis. */
    coveredX: readonly [number, number];
  };
}

export interface CalibrationDoubtsOptions {
  /**
   * The automatic pairing's confidence (0–1); leave it out when the pairs were seeded by hand, which
   * the confidence does not describe.
   */
  automaticConfidence?: number;
  /**
   * Fewer used pairs than this are a doubt.
   * @default MIN_TRUSTED_PAIRS (6)
   */
  minPairs?: number;
  /**
   * A covered share of the array (coveredX span over the domain's span) below this is a doubt.
   * @default 0.6
   */
  minCoveredFraction?: number;
  /**
   * One or two end pairs beyond a gap wider than this share of the covered wavelength span are a doubt.
   * @default 0.3
   */
  maxEndGapFraction?: number;
  /**
   * An automatic pairing's confidence below this is a doubt.
   * @default 0.5
   */
  minConfidence?: number;
}

function assertFraction(value: number, name: string): void {
  if (!(Number.isFinite(value) && value >= 0 && value <= 1))
    throw new RangeError(`${name} must be within [0, 1], got ${value}`);
}

const nm = (value: number) => value.toFixed(1);

/** The doubts about a fitted calibration, as sentences; [] when there are none. */
export function calibrationDoubts(
  fit: CalibrationDoubtsFit,
  options: CalibrationDoubtsOptions = {},
): string[] {
  const {
    automaticConfidence,
    minPairs = MIN_TRUSTED_PAIRS,
    minCoveredFraction = 0.6,
    maxEndGapFraction = 0.3,
    minConfidence = 0.5,
  } = options;
  if (!Number.isInteger(minPairs) || minPairs < 1)
    throw new RangeError(`minPairs must be a positive integer, got ${minPairs}`);
  assertFraction(minCoveredFraction, "minCoveredFraction");
  assertFraction(maxEndGapFraction, "maxEndGapFraction");
  assertFraction(minConfidence, "minConfidence");
  if (automaticConfidence !== undefined && !Number.isFinite(automaticConfidence)) {
    throw new RangeError(`automaticConfidence must be finite, got ${automaticConfidence}`);
  }
  const [x0, x1] = fit.model.domain;
  if (!(Number.isFinite(x0) && Number.isFinite(x1) && x0 !== x1))
    throw new RangeError(`model.domain must be two different finite numbers`);
  const [c0, c1] = fit.model.coveredX;
  if (!(Number.isFinite(c0) && Number.isFinite(c1)))
    throw new RangeError(`model.coveredX must be finite`);
  const used = fit.pairs.filter((p) => p.used).map((p) => p.wavelengthNm);
  used.forEach((w, i) => {
    if (!(Number.isFinite(w) && w > 0))
      throw new RangeError(`used pair ${i} has a wavelength that is not positive and finite: ${w}`);
  });
  used.sort((a, b) => a - b);

  const doubts: string[] = [];
  if (used.length < minPairs) {
    doubts.push(
      `Only ${used.length} pair${used.length === 1 ? " is" : "s are"} used in the fit; at least ${minPairs} are wanted before a calibration is trusted.`,
    );
  }

  const covered = Math.abs(c1 - c0) / Math.abs(x1 - x0);
  if (covered < minCoveredFraction) {
    // Rounded down, so that a doubtful share never reads as the threshold itself.
    doubts.push(
      `The pairs cover ${Math.floor(covered * 100)} % of the array; wavelengths outside are extrapolated.`,
    );
  }

  const n = used.length;
  const spanNm = n >= 2 ? used[n - 1] - used[0] : 0;
  if (n >= 3 && spanNm > 0) {
    const limitNm = maxEndGapFraction * spanNm;
    const range = `${nm(used[0])}–${nm(used[n - 1])} nm`;
    // k pairs isolated at an end: the gap between the k-th and the (k+1)-th pair from that end.
    const endGap = (gapAt: (k: number) => number) => {
      let best: { k: number; gapNm: number } | null = null;
      for (let k = 1; k <= 2 && n - k >= 2; k++) {
        const gapNm = gapAt(k);
        if (gapNm > limitNm && (!best || gapNm > best.gapNm)) best = { k, gapNm };
      }
      return best;
    };
    const low = endGap((k) => used[k] - used[k - 1]);
    if (low) {
      const pairs =
        low.k === 1
          ? `1 pair (${nm(used[0])} nm)`
          : `2 pairs (${nm(used[0])} and ${nm(used[1])} nm)`;
      doubts.push(
        `The short-wavelength end rests on ${pairs} beyond a gap of ${nm(low.gapNm)} nm with no pair, ` +
          `${Math.round((100 * low.gapNm) / spanNm)} % of the covered ${range}; a wrong pair there would bend that whole end.`,
      );
    }
    const high = endGap((k) => used[n - k] - used[n - k - 1]);
    if (high) {
      const pairs =
        high.k === 1
          ? `1 pair (${nm(used[n - 1])} nm)`
          : `2 pairs (${nm(used[n - 2])} and ${nm(used[n - 1])} nm)`;
      doubts.push(
        `The long-wavelength end rests on ${pairs} beyond a gap of ${nm(high.gapNm)} nm with no pair, ` +
          `${Math.round((100 * high.gapNm) / spanNm)} % of the covered ${range}; a wrong pair there would bend that whole end.`,
      );
    }
  }

  if (automaticConfidence !== undefined && automaticConfidence < minConfidence) {
    doubts.push(
      `The automatic pairing's confidence is ${automaticConfidence.toFixed(2)}, under ${minConfidence}: some peaks may be paired with the wrong lines.`,
    );
  }
  return doubts;
}
