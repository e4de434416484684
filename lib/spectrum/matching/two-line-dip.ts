// How deep the dip between two lines of one instrument profile is: whether a peak finder can tell a
// partly resolved companion from the stronger line's wing. Two Gaussians of equal FWHM, the stronger of
// height 1 at 0 and the other of height `ratio` (≤ 1) at `separationFwhm`; the dip is the companion's
// own maximum less the least value between them, as a share of the stronger line's height (0 when the
// companion makes no maximum of its own, a shoulder only).

const FOUR_LN2 = 4 * Math.LN2;

/** The dip's depth as a share of the stronger line's height; 0 for a shoulder or a ratio outside (0, 1]. */
export function twoLineDip(separationFwhm: number, ratio: number): number {
  if (!(ratio > 0 && ratio <= 1) || !(separationFwhm > 0) || !Number.isFinite(separationFwhm))
    return 0;
  const d = separationFwhm;
  const profile = (x: number) =>
    Math.exp(-FOUR_LN2 * x * x) + ratio * Math.exp(-FOUR_LN2 * (x - d) * (x - d));
  // Sampled finely between the lines and a little beyond the companion: 400 points are ample for a
  // profile this smooth (the answer is compared with a threshold, not reported).
  const steps = 400;
  // Past the stronger line's own maximum (which the companion's wing moves a little towards it), down
  // into the valley, then up to the companion's maximum if it has one.
  let phase: "top" | "valley" | "companion" = "top";
  let least = Infinity;
  let companionMax = -Infinity;
  let previous = profile(0);
  for (let k = 1; k <= steps; k++) {
    const x = (1.5 * d * k) / steps;
    const value = profile(x);
    if (phase === "top" && value < previous) phase = "valley";
    if (phase === "valley") {
      if (value > previous) phase = "companion";
      else least = Math.min(least, value);
    }
    if (phase === "companion") companionMax = Math.max(companionMax, value);
    previous = value;
  }
  const sawRise = phase === "companion";
  if (!sawRise) return 0;
  return Math.max(0, companionMax - least);
}
