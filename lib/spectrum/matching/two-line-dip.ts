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
  return dipUntil(separationFwhm, ratio, samplesPerFwhm, (dip) => !(dip > 0));
}

/**
 * Whether `height` × twoLineDip(separationFwhm, ratio, samplesPerFwhm) is below `depth`, the same
 * answer for less work: with the sampling given, the first placing of the grid whose dip is shallow
 * enough settles it (the dip is the least over the placings, and scaling by a positive height keeps
 * their order).
 */
export function dipIsShallow(
  separationFwhm: number,
  ratio: number,
  samplesPerFwhm: number | undefined,
  height: number,
  depth: number,
): boolean {
  return (
    height * dipUntil(separationFwhm, ratio, samplesPerFwhm, (dip) => height * dip < depth) < depth
  );
}

/** twoLineDip, or with the sampling given, the dip of the first placing for which `settled` holds
 * (the least over all placings when none does). */
function dipUntil(
  separationFwhm: number,
  ratio: number,
  samplesPerFwhm: number | undefined,
  settled: (dip: number) => boolean,
): number {
  if (!(ratio > 0 && ratio <= 1) || !(separationFwhm > 0) || !Number.isFinite(separationFwhm))
    return 0;
  const d = separationFwhm;
  if (
    samplesPerFwhm !== undefined &&
    samplesPerFwhm > 0 &&
    samplesPerFwhm < CONTINUOUS_SAMPLES_PER_FWHM
  ) {
    let least = Infinity;
    for (let phase = 0; phase < PHASES && !settled(least); phase++) {
      least = Math.min(least, sampledDip(d, ratio, 1 / samplesPerFwhm, phase / PHASES));
    }
    return least;
  }
  return continuousDip(d, ratio);
}

/** The dip of the continuous profile, sampled finely between the lines and a little beyond the
 * companion: 400 steps are ample for a profile this smooth (the answer is compared with a threshold,
 * not reported). */
function continuousDip(d: number, ratio: number): number {
  const steps = 400;
  const values = profileSamples(steps + 1, 0, (1.5 * d) / steps, d, ratio);
  // Past the stronger line's own maximum (which the companion's wing moves a little towards it), down
  // into the valley, then up to the companion's maximum if it has one.
  let phase: "top" | "valley" | "companion" = "top";
  let least = Infinity;
  let companionMax = -Infinity;
  for (let k = 1; k <= steps; k++) {
    const value = values[k];
    const previous = values[k - 1];
    if (phase === "top" && value < previous) phase = "valley";
    if (phase === "valley") {
      if (value > previous) phase = "companion";
      else least = Math.min(least, value);
    }
    if (phase === "companion") companionMax = Math.max(companionMax, value);
  }
  const sawRise = phase === "companion";
  if (!sawRise) return 0;
  return Math.max(0, companionMax - least);
}

/** Samples of one profile, reused from call to call (grown when a wider pair needs more). */
let samples = new Float64Array(512);

/** The pair's profile at x = x0 + j·step, j = 0 … n − 1, in the shared buffer (valid until the next
 * call). */
function profileSamples(
  n: number,
  x0: number,
  step: number,
  d: number,
  ratio: number,
): Float64Array {
  if (samples.length < n) samples = new Float64Array(2 * n);
  samples.fill(0, 0, n);
  addSampledGaussian(samples, n, x0, step, 0, 1);
  addSampledGaussian(samples, n, x0, step, d, ratio);
  return samples;
}

/** The dip between the stronger line's top and the companion's in samples `step` apart (FWHM units),
 * the grid shifted by `phase` of a step; 0 when no sample stands above its neighbours at the companion. */
function sampledDip(d: number, ratio: number, step: number, phase: number): number {
  const first = Math.floor(-1 / step);
  const last = Math.ceil((d + 1) / step);
  const n = last - first + 1;
  const values = profileSamples(n, (first + phase) * step, step, d, ratio);
  // The stronger line's top: the largest sample on its side of the midpoint; then down into the
  // valley and up to a top of the companion's, if the samples make one before it fades.
  let top = 0;
  for (let i = 1; (first + i + phase) * step <= d / 2; i++) if (values[i] > values[top]) top = i;
  let i = top + 1;
  while (i < n && values[i] <= values[i - 1]) i++;
  if (i >= n) return 0;
  const valley = values[i - 1];
  let companion = values[i];
  while (i + 1 < n && values[i + 1] > values[i]) companion = values[++i];
  return Math.max(0, companion - valley);
}

/**
 * Adds `height` × exp(−4 ln2 (x − centre)²) at x = x0 + j·step, j = 0 … n − 1, to `into`. From the
 * sample nearest the centre outwards, each sample is the one before times the ratio of neighbouring
 * samples, a ratio that itself changes by a constant factor: a few exponentials for the whole grid
 * instead of one per sample. Walking outwards the samples only fall, so nothing overflows, and the walk
 * stops where they reach zero. (The dips are compared with a threshold; the products' rounding, within
 * some 1e-12 of the height, is far below any that matters.)
 */
function addSampledGaussian(
  into: Float64Array,
  n: number,
  x0: number,
  step: number,
  centre: number,
  height: number,
): void {
  const nearest = Math.min(n - 1, Math.max(0, Math.round((centre - x0) / step)));
  const u = x0 + nearest * step - centre;
  const top = height * Math.exp(-FOUR_LN2 * u * u);
  const change = Math.exp(-2 * FOUR_LN2 * step * step);
  into[nearest] += top;
  for (const direction of [1, -1]) {
    const h = direction * step;
    let ratio = Math.exp(-FOUR_LN2 * (2 * u * h + h * h));
    let value = top * ratio;
    for (let j = nearest + direction; j >= 0 && j < n && value > 0; j += direction) {
      into[j] += value;
      ratio *= change;
      value *= ratio;
    }
  }
}
