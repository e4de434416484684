// How deep the dip between two lines of one instrument profile is: whether a peak finder can tell a
// partly resolved companion from the stronger line's wing. Two Gaussians of equal FWHM, the stronger of
// height 1 at 0 and the other of height `ratio` (≤ 1) at `separationFwhm`; the dip is the companion's
// own maximum less the least value between them, as a share of the stronger line's height (0 when the
// companion makes no maximum of its own, a shoulder only).

const FOUR_LN2 = 4 * Math.LN2;

/** Phases of the sample grid against the lines tried when the sampling is given. */
const PHASES = 16;
/** Sampled this finely or more, the samples show the continuous dip to within a per cent of the line
 * (and the cost of sampling the profile stays bounded, whatever the array's sampling). */
const CONTINUOUS_SAMPLES_PER_FWHM = 20;

/**
 * The dip's depth as a share of the stronger line's height; 0 for a shoulder or a ratio outside (0, 1].
 * With `samplesPerFwhm`, the dip the samples show at the least favourable placing of the grid against
 * the lines: at 2.5 samples per FWHM the Na D pair 1.35 FWHM apart can fall so that no sample stands
 * above its neighbours at D1, though the continuous profile dips by a tenth of D2 between them.
 */
export function twoLineDip(separationFwhm: number, ratio: number, samplesPerFwhm?: number): number {
  if (!(ratio > 0 && ratio <= 1) || !(separationFwhm > 0) || !Number.isFinite(separationFwhm))
    return 0;
  const d = separationFwhm;
  const profile = (x: number) =>
    Math.exp(-FOUR_LN2 * x * x) + ratio * Math.exp(-FOUR_LN2 * (x - d) * (x - d));
  if (
    samplesPerFwhm !== undefined &&
    samplesPerFwhm > 0 &&
    samplesPerFwhm < CONTINUOUS_SAMPLES_PER_FWHM
  ) {
    let least = Infinity;
    for (let phase = 0; phase < PHASES && least > 0; phase++) {
      least = Math.min(least, sampledDip(profile, d, 1 / samplesPerFwhm, phase / PHASES));
    }
    return least;
  }
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

/** The dip between the stronger line's top and the companion's in samples `step` apart (FWHM units),
 * the grid shifted by `phase` of a step; 0 when no sample stands above its neighbours at the companion. */
function sampledDip(
  profile: (x: number) => number,
  d: number,
  step: number,
  phase: number,
): number {
  const first = Math.floor(-1 / step);
  const last = Math.ceil((d + 1) / step);
  const values: number[] = [];
  for (let k = first; k <= last; k++) values.push(profile((k + phase) * step));
  // The stronger line's top: the largest sample on its side of the midpoint; then down into the
  // valley and up to a top of the companion's, if the samples make one before it fades.
  let top = 0;
  for (let i = 1; (first + i + phase) * step <= d / 2; i++) if (values[i] > values[top]) top = i;
  let i = top + 1;
  while (i < values.length && values[i] <= values[i - 1]) i++;
  if (i >= values.length) return 0;
  const valley = values[i - 1];
  let companion = values[i];
  while (i + 1 < values.length && values[i + 1] > values[i]) companion = values[++i];
  return Math.max(0, companion - valley);
}
