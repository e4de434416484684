// The faintest relative intensity whose predicted SNR reaches a threshold, exact in floating point.

/**
 * The smallest relative intensity v ≥ 0 whose predicted SNR, scale × v in floating point, is not
 * below missingSnr (Infinity when none is). The product is monotone in v, so a line counts exactly
 * when its relative intensity reaches this value; it is found from missingSnr / scale by stepping
 * a few units in the last place.
 */
export function leastRelativeAtLeast(scale: number, missingSnr: number): number {
  const counts = (v: number) => !(scale * v < missingSnr);
  if (counts(0)) return 0;
  if (!counts(Number.MAX_VALUE)) return Infinity;
  let v = Math.min(Number.MAX_VALUE, missingSnr / scale);
  while (!counts(v)) v = nextDouble(v, 1);
  while (v > 0 && counts(nextDouble(v, -1))) v = nextDouble(v, -1);
  return v;
}

const doubleView = new Float64Array(1);
const bitsView = new BigInt64Array(doubleView.buffer);

/** The neighbouring double of a non-negative finite v, upwards (+1) or downwards (−1). */
function nextDouble(v: number, direction: 1 | -1): number {
  doubleView[0] = v;
  bitsView[0] += BigInt(direction);
  return doubleView[0];
}
