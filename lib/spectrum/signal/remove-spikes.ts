// Hot pixels and cosmic-ray hits: single samples far above both neighbours. A spectral line is imaged
// over several samples (a spectrometer samples its slit image at two or more pixels, common practice),
// so a line's neighbours stand at least a third of its height above the local level; a spike's stand
// at noise. The peak finder smooths before it looks, which turns a one-sample spike into a narrow
// "line" three samples wide: the spikes must go before it runs.
import { assertFiniteArray } from "./assert-finite-array";
import { estimateNoise } from "./estimate-noise";
import { median } from "../statistics/median";

export interface RemoveSpikesOptions {
  /**
   * A spike rises at least this many noise σ above the local level.
   * @default 8
   */
  minSnr?: number;
  /**
   * …and its higher neighbour rises at most this share of its height. A Gaussian line 1.3 samples
   * wide (FWHM) already has neighbours at about 0.2 of its height.
   * @default 0.15
   */
  maxNeighbourShare?: number;
  /**
   * Samples on either side that set the local level (their median).
   * @default 5
   */
  halfWindow?: number;
}

export interface RemovedSpikes {
  /** A copy of y with each spike replaced by the mean of its neighbours. */
  y: Float64Array;
  /** Indices of the replaced samples, increasing. */
  spikes: number[];
}

/** Replaces one-sample spikes of `y` (interior samples only) by the mean of their neighbours. */
export function removeSpikes(y: Float64Array, options: RemoveSpikesOptions = {}): RemovedSpikes {
  assertFiniteArray(y, "y", 1);
  const { minSnr = 8, maxNeighbourShare = 0.15, halfWindow = 5 } = options;
  if (!(minSnr > 0)) throw new RangeError(`minSnr must be positive (got ${minSnr})`);
  if (!(maxNeighbourShare > 0 && maxNeighbourShare < 1)) {
    throw new RangeError(`maxNeighbourShare must lie in (0, 1) (got ${maxNeighbourShare})`);
  }
  if (!(Number.isInteger(halfWindow) && halfWindow >= 2)) {
    throw new RangeError(`halfWindow must be an integer ≥ 2 (got ${halfWindow})`);
  }
  const out = Float64Array.from(y);
  const spikes: number[] = [];
  if (y.length < 3) return { y: out, spikes };
  const noise = estimateNoise(y);
  for (let i = 1; i < y.length - 1; i++) {
    const higher = Math.max(y[i - 1], y[i + 1]);
    // Cheap tests first: most samples are not even above both neighbours.
    if (!(y[i] > higher)) continue;
    const around: number[] = [];
    for (let k = Math.max(0, i - halfWindow); k <= Math.min(y.length - 1, i + halfWindow); k++) {
      if (k !== i) around.push(y[k]);
    }
    const level = median(around);
    const height = y[i] - level;
    if (!(height > minSnr * noise && height > 0)) continue;
    if (higher - level > maxNeighbourShare * height) continue;
    out[i] = 0.5 * (y[i - 1] + y[i + 1]);
    spikes.push(i);
  }
  return { y: out, spikes };
}
