// Noise that grows with the signal: a detector's σ² = σ_read² + level/gain, fitted block by block,
// so peaks on a bright continuum are judged against the shot noise there, not the array's median.
import { assertFiniteArray } from "./assert-finite-array";
import { assertIntegerInRange } from "./assert-integer-in-range";
import { estimateNoise } from "./estimate-noise";
import { theilSenLine } from "./theil-sen-line";
import { xMedian } from "./x-median";

export interface EstimateNoiseProfileOptions {
  /**
   * Samples per block; each block gives one robust σ and one median level. 64 samples hold a
   * MAD's relative error near 15 % while leaving some 30 blocks on a 2048-pixel array.
   * @default 64
   */
  blockSize?: number;
  /**
   * Fewest blocks for which a fit is tried; shorter arrays get null (one global σ).
   * @default 8
   */
  minBlocks?: number;
  /**
   * Most blocks in the fit. Theil–Sen visits every pair of blocks, so on long arrays the blocks
   * are widened until there are at most this many (a million samples would otherwise give some
   * 134 million slopes); wider blocks only make each block's σ more precise.
   * @default 256
   */
  maxBlocks?: number;
  /**
   * The profile is kept only when the modelled σ over the array spans at least this ratio
   * (largest / smallest); below it a constant σ is as good and today's numbers stay unchanged.
   * @default 1.25
   */
  minSpread?: number;
}

/**
 * Per-sample noise σ of the raw counts `y` as a function of the background `level` under each
 * sample (the prepared continuum: it sets the shot noise that a line must rise above).
 *
 * Each block of `blockSize` samples gives σ_b (MAD of the second difference / (0.6745·√6), as
 * estimateNoise does; peaks occupy a minority of a block and the median ignores them) and L_b,
 * the median level. σ² = a + b·L is fitted by Theil–Sen (median of the pairwise slopes, then the
 * median intercept; robust to about 29 % of odd blocks, such as a clipped run or a line forest),
 * clamped below at the blocks' 10th-percentile σ, and evaluated at every sample's level.
 *
 * Returns null when the model is no better than a constant: too few blocks, b ≤ 0, or a modelled
 * σ that spans less than `minSpread` over the array.
 */
export function estimateNoiseProfile(
  y: Float64Array,
  level: Float64Array,
  options: EstimateNoiseProfileOptions = {},
): Float64Array | null {
  const {
    blockSize: requestedBlockSize = 64,
    minBlocks = 8,
    maxBlocks = 256,
    minSpread = 1.25,
  } = options;
  assertFiniteArray(y, "y", 3);
  assertFiniteArray(level, "level", 3);
  if (level.length !== y.length)
    throw new RangeError(`y and level differ in length (${y.length} vs ${level.length})`);
  assertIntegerInRange(requestedBlockSize, "blockSize", 8);
  assertIntegerInRange(minBlocks, "minBlocks", 3);
  assertIntegerInRange(maxBlocks, "maxBlocks", minBlocks);
  if (!(minSpread >= 1) || !Number.isFinite(minSpread))
    throw new RangeError(`minSpread must be at least 1 (got ${minSpread})`);

  const n = y.length;
  const blockSize = Math.max(requestedBlockSize, Math.ceil(n / maxBlocks));
  const blocks = Math.floor(n / blockSize);
  if (blocks < minBlocks) return null;
  const variance = new Float64Array(blocks);
  const blockLevel = new Float64Array(blocks);
  for (let b = 0; b < blocks; b++) {
    const start = b * blockSize;
    // The last block takes the remainder so every sample counts.
    const end = b === blocks - 1 ? n : start + blockSize;
    const sigma = estimateNoise(y.subarray(start, end));
    variance[b] = sigma * sigma;
    blockLevel[b] = xMedian(level.subarray(start, end));
  }

  const line = theilSenLine(blockLevel, variance);
  if (!line || !(line.slope > 0)) return null;
  const { slope, intercept } = line;

  // A model below the quieter blocks is extrapolating (a negative intercept, a level below any
  // block's), so it is held at the blocks' 10th-percentile σ; a percentile rather than the minimum,
  // because a clipped run or an exactly flat stretch can make one block's σ near zero.
  const sortedVariance = Float64Array.from(variance).sort();
  const floorVariance = sortedVariance[Math.floor(0.1 * (blocks - 1))];
  if (!(floorVariance > 0)) return null;

  const profile = new Float64Array(n);
  let lowest = Infinity;
  let highest = 0;
  for (let i = 0; i < n; i++) {
    const sigma = Math.sqrt(Math.max(floorVariance, intercept + slope * level[i]));
    profile[i] = sigma;
    if (sigma < lowest) lowest = sigma;
    if (sigma > highest) highest = sigma;
  }
  return highest / lowest < minSpread ? null : profile;
}
