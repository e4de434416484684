// A seeded generator of realistic emission samples with a known truth (which elements are in the mix
// and which of their lines fall in range), the measuring stick of element identification. It is its
// own code on purpose: it draws its own lines, bands, continuum and noise and shares no drawing code
// with lib/spectrum/synthetic, so a bug there cannot hide itself here. Only the seeded random stream
// (makeRandom) and the starter table are shared.
//
// What a chemist's sample shows that a clean test spectrum does not:
// - 1–5 elements among the flame-test metals, at the starter table's air wavelengths with the table's
//   relative intensities for the kind of source (flame or DC arc), each element at its own strength;
// - the metal's hydroxide/halide/oxide band where the table lists one for flames (CaOH, SrOH, BaCl, CuCl, BO₂);
// - gratings (nearly constant FWHM in nm) and prisms (constant slit image in pixels, so the FWHM in nm
//   grows to the red), on a pixel axis with a lamp calibration or on a wavelength axis;
// - a Planck-like continuum, Poisson and read noise, a dark offset, a few weak unlisted impurity lines;
// - in about a third of the samples one of the known interference cases of issue 12.
import type { CalibrationModel } from "@/lib/spectrum/calibration";
import { compareCalibrationModels, fitCalibration } from "@/lib/spectrum/calibration";
import { makeRandom, type SeededRandom } from "@/lib/spectrum/statistics/make-random";
import type { ReferenceLine } from "@/lib/spectrum/types";
import { GENERATOR_GLASSES, STARTER_TABLE } from "./realistic-lamp";

/** The elements a sample mixes (the flame-test metals of issue 12). */
export const SAMPLE_ELEMENTS = [
  "Li",
  "Na",
  "K",
  "Rb",
  "Cs",
  "Ca",
  "Sr",
  "Ba",
  "Cu",
  "In",
  "Tl",
  "B",
  "Mn",
] as const;

/** The band molecules whose metal they show (a band called present counts for its metal). */
export const BAND_METAL: Readonly<Record<string, string>> = {
  CaOH: "Ca",
  SrOH: "Sr",
  BaCl: "Ba",
  CuCl: "Cu",
  BO2: "B",
};

export type SampleSource = "flame" | "arc";
export type SampleInstrument = "grating" | "prism";
export type SampleAxis = "pixel" | "wavelength";

/** The known interference cases of issue 12: the element in the mix, the one that must not be called. */
export const INTERFERENCE_CASES = [
  {
    name: "Mg II beside Mn 279.5/280.1",
    element: "Mn",
    interferer: "Mg",
    rangeNm: [255, 420],
    source: "arc",
  },
  {
    name: "Ba II 455.40 beside Cs 455.53",
    element: "Cs",
    interferer: "Ba",
    rangeNm: [420, 880],
    source: "arc",
  },
  {
    name: "Mn I beside K 404.4",
    element: "K",
    interferer: "Mn",
    rangeNm: [380, 800],
    source: "flame",
  },
  {
    name: "Al I 394.40 beside Ca II in arcs",
    element: "Ca",
    interferer: "Al",
    rangeNm: [360, 700],
    source: "arc",
  },
  {
    name: "Na D at low resolution",
    element: "Na",
    interferer: null,
    rangeNm: [400, 800],
    source: "flame",
  },
] as const satisfies readonly {
  name: string;
  element: string;
  interferer: string | null;
  rangeNm: readonly [number, number];
  source: SampleSource;
}[];

export type InterferenceCase = (typeof INTERFERENCE_CASES)[number];

/** One line the generator drew. */
export interface DrawnLine {
  species: string;
  /** The element (metal) it belongs to, or "impurity" for an unlisted impurity line. */
  element: string;
  wavelengthNm: number;
  /** Peak height above the continuum, counts (before noise). */
  amplitudeCounts: number;
  fwhmNm: number;
  /** Row id in the starter table; null for an unlisted impurity line. */
  lineId: string | null;
}

export interface RealisticSampleTruth {
  /** Elements in the mix (symbols from SAMPLE_ELEMENTS). */
  elements: string[];
  /** Every drawn line inside the range, bands by their head. */
  lines: DrawnLine[];
  /** Per element of the mix: is its principal line for this source (the table's strongest) in range? */
  principalInRange: Record<string, boolean>;
  /** Per element of the mix: the counts of its principal line (0 when out of range). */
  principalCounts: Record<string, number>;
  /** The interference case built into the sample, if any. */
  interference: InterferenceCase["name"] | null;
  /** Wavelength range covered, nm. */
  rangeNm: [number, number];
}

export interface RealisticSample {
  seed: number;
  x: Float64Array;
  y: Float64Array;
  source: SampleSource;
  instrument: SampleInstrument;
  axis: SampleAxis;
  /** The lamp calibration of a pixel axis (fitted to the true dispersion at lamp-like points); null on a wavelength axis. */
  calibration: CalibrationModel | null;
  /** What the chemist states about resolution, as analyzeSample options: a grating's FWHM in nm, a
   * prism's slit image in px on a pixel axis, nothing for a prism on a wavelength axis (no one number fits). */
  resolution: { resolutionNm?: number; resolutionPx?: number };
  /** Grating FWHM in nm, or prism slit image in px. */
  instrumentWidth: { fwhm: number; unit: "nm" | "px" };
  /** Mean read noise, counts. */
  readNoiseCounts: number;
  truth: RealisticSampleTruth;
}

export interface RealisticSampleOptions {
  /** Number of detector pixels. @default 2048 */
  pixelCount?: number;
  /** Force the kind of source. @default drawn (flame 60 %, arc 40 %) */
  source?: SampleSource;
  /** Force the instrument. @default drawn (grating 65 %, prism 35 %) */
  instrument?: SampleInstrument;
  /** Force the axis. @default drawn (pixel 60 %, wavelength 40 %) */
  axis?: SampleAxis;
  /** Share of samples built around an interference case. @default 0.3 */
  interferenceShare?: number;
}

const ATOMIC = STARTER_TABLE.filter((l) => !l.flags.bandHead);
const BANDS = STARTER_TABLE.filter((l) => l.flags.bandHead && l.band && BAND_METAL[l.species]);

/** The element's atomic lines (all ion stages) with a relative intensity for the source. */
export function elementLines(element: string, source: SampleSource): ReferenceLine[] {
  return ATOMIC.filter(
    (l) => l.element === element && (l.intensities[source] ?? 0) > 0 && l.airNm > 200,
  );
}

/** The element's principal line for the source: the table's strongest (first in table order on ties). */
export function principalLine(element: string, source: SampleSource): ReferenceLine | null {
  let best: ReferenceLine | null = null;
  for (const l of elementLines(element, source)) {
    if (!best || (l.intensities[source] ?? 0) > (best.intensities[source] ?? 0)) best = l;
  }
  return best;
}

const between = (random: SeededRandom, low: number, high: number) =>
  low + (high - low) * random.uniform();
const logBetween = (random: SeededRandom, low: number, high: number) =>
  Math.exp(between(random, Math.log(low), Math.log(high)));
function shuffled<T>(random: SeededRandom, items: readonly T[]): T[] {
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random.uniform() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

function glassIndex(glass: (typeof GENERATOR_GLASSES)[string], wavelengthNm: number): number {
  const l2 = (wavelengthNm / 1000) ** 2;
  let sum = 0;
  for (let i = 0; i < 3; i++) sum += (glass.b[i] * l2) / (l2 - glass.cUm2[i]);
  return Math.sqrt(1 + sum);
}

/** λ at each pixel (ascending with pixel) for the drawn instrument. */
function wavelengthAxis(
  random: SeededRandom,
  instrument: SampleInstrument,
  pixelCount: number,
  rangeNm: [number, number],
): Float64Array {
  const out = new Float64Array(pixelCount);
  const [low, high] = rangeNm;
  if (instrument === "grating") {
    // A slightly curved grating dispersion (a few nm of bow over the array).
    const bowNm = between(random, -0.02, 0.02) * (high - low);
    for (let px = 0; px < pixelCount; px++) {
      const u = px / (pixelCount - 1);
      out[px] = low + (high - low) * u + bowNm * u * (u - 1);
    }
    return out;
  }
  // Near minimum deviation the ray's angle, and so the pixel, is about linear in the refractive
  // index (common practice): pixel ∝ n(low) − n(λ). Inverted by bisection.
  const names = Object.keys(GENERATOR_GLASSES).filter((g) => GENERATOR_GLASSES[g].minNm <= low);
  const glass = GENERATOR_GLASSES[names[Math.floor(random.uniform() * names.length)]];
  const nLow = glassIndex(glass, low);
  const nHigh = glassIndex(glass, high);
  for (let px = 0; px < pixelCount; px++) {
    const target = nLow + ((nHigh - nLow) * px) / (pixelCount - 1);
    let [a, b] = [low, high];
    for (let k = 0; k < 50; k++) {
      const mid = 0.5 * (a + b);
      if (glassIndex(glass, mid) > target) a = mid;
      else b = mid;
    }
    out[px] = 0.5 * (a + b);
  }
  return out;
}

/** Planck-like λ⁻⁵/(exp(c₂/λT) − 1), unscaled. */
function planck(wavelengthNm: number, temperatureK: number): number {
  const c2NmK = 1.4388e7;
  return wavelengthNm ** -5 / Math.expm1(c2NmK / (wavelengthNm * temperatureK));
}

/**
 * One realistic sample from its seed (the same seed and options give the same sample).
 */
export function realisticSample(
  seed: number,
  options: RealisticSampleOptions = {},
): RealisticSample {
  const random = makeRandom(seed);
  const pixelCount = options.pixelCount ?? 2048;
  const interferenceShare = options.interferenceShare ?? 0.3;
  const interference =
    random.uniform() < interferenceShare
      ? INTERFERENCE_CASES[Math.floor(random.uniform() * INTERFERENCE_CASES.length)]
      : null;
  const source: SampleSource =
    options.source ?? interference?.source ?? (random.uniform() < 0.6 ? "flame" : "arc");
  const instrument: SampleInstrument =
    options.instrument ??
    // The Na D case needs a coarse grating; the Mg II/Mn case lies below the generator's prism glasses' UV cut.
    (interference?.name === "Na D at low resolution" ||
    (interference && interference.rangeNm[0] < 330)
      ? "grating"
      : random.uniform() < 0.65
        ? "grating"
        : "prism");
  const axis: SampleAxis = options.axis ?? (random.uniform() < 0.6 ? "pixel" : "wavelength");

  // Range: the interference case's window, else a typical flame or arc range.
  let rangeNm: [number, number];
  if (interference) {
    const [low, high] = interference.rangeNm;
    const lowNm = low + between(random, 0, 10);
    rangeNm = [lowNm, Math.min(high, lowNm + between(random, 0.6, 1) * (high - low))];
  } else {
    const lowNm = source === "flame" ? between(random, 360, 420) : between(random, 250, 400);
    rangeNm = [lowNm, Math.min(900, lowNm + between(random, 300, 520))];
  }
  // Prisms of the generator's glasses are used only above their UV cut.
  if (instrument === "prism") rangeNm[0] = Math.max(rangeNm[0], 330);

  // The mix: 1–5 elements; the interference case's element always, its interferer never.
  const count = 1 + Math.floor(random.uniform() * 5);
  const pool = shuffled(random, SAMPLE_ELEMENTS).filter(
    (e) => e !== interference?.element && e !== interference?.interferer,
  );
  const elements: string[] = [...(interference ? [interference.element] : []), ...pool].slice(
    0,
    count,
  );

  const wavelengths = wavelengthAxis(random, instrument, pixelCount, rangeNm);
  const dispersionNmPerPx = (px: number) => {
    const i = Math.min(pixelCount - 2, Math.max(0, Math.round(px)));
    return wavelengths[i + 1] - wavelengths[i];
  };
  const pixelOf = (wavelengthNm: number) => {
    let [a, b] = [0, pixelCount - 1];
    while (b - a > 1) {
      const mid = (a + b) >> 1;
      if (wavelengths[mid] < wavelengthNm) a = mid;
      else b = mid;
    }
    return a + (wavelengthNm - wavelengths[a]) / (wavelengths[b] - wavelengths[a]);
  };

  // Resolution: a grating's FWHM in nm (coarse for the Na D case), a prism's slit image in px.
  // Never narrower than 2.5 px: a real instrument is sampled at least that finely (common practice),
  // and the chemist states the width the lines really have.
  const maxStepNm = Math.max(
    ...Array.from({ length: pixelCount - 1 }, (_, i) => wavelengths[i + 1] - wavelengths[i]),
  );
  const gratingFwhmNm = Math.max(
    2.5 * maxStepNm,
    interference?.name === "Na D at low resolution"
      ? between(random, 0.8, 2)
      : logBetween(random, 0.08, 1.2),
  );
  const slitPx = between(random, 2.2, 4);
  const fwhmNmAt = (wavelengthNm: number) =>
    instrument === "grating"
      ? gratingFwhmNm
      : slitPx * Math.abs(dispersionNmPerPx(pixelOf(wavelengthNm)));

  const lines: DrawnLine[] = [];
  const principalInRange: Record<string, boolean> = {};
  const principalCounts: Record<string, number> = {};
  const inRange = (nm: number) => nm >= rangeNm[0] && nm <= rangeNm[1];
  const readNoiseCounts = between(random, 3, 12);
  for (const element of elements) {
    // Strength of the element's principal line: from near the detection limit to thousands of counts.
    const principalPeakCounts = logBetween(random, 25 * readNoiseCounts, 30000);
    const principal = principalLine(element, source);
    const principalIntensity = principal?.intensities[source] ?? 1000;
    principalInRange[element] = principal ? inRange(principal.airNm) : false;
    principalCounts[element] = 0;
    for (const line of elementLines(element, source)) {
      if (!inRange(line.airNm)) continue;
      // The table's relative intensities are rough: each line scatters by about ±30 %.
      const relative = (line.intensities[source] ?? 0) / principalIntensity;
      const amplitudeCounts = principalPeakCounts * relative * Math.exp(0.3 * random.normal());
      lines.push({
        species: line.species,
        element,
        wavelengthNm: line.airNm,
        amplitudeCounts,
        fwhmNm: fwhmNmAt(line.airNm),
        lineId: line.id,
      });
      if (line === principal) principalCounts[element] = amplitudeCounts;
    }
  }

  // Bands of the mix's metals in a flame: a sharp head fading away over the band's extent.
  const bands: { headNm: number; extentNm: number; toRed: boolean; amplitudeCounts: number }[] = [];
  if (source === "flame") {
    for (const band of BANDS) {
      const metal = BAND_METAL[band.species];
      if (!elements.includes(metal) || !inRange(band.airNm) || !band.band) continue;
      const amplitudeCounts = between(random, 0.05, 0.4) * (band.intensities.flame ?? 0);
      bands.push({
        headNm: band.airNm,
        extentNm: band.band.extentNm,
        toRed: band.band.degradesTo === "red",
        amplitudeCounts,
      });
      lines.push({
        species: band.species,
        element: metal,
        wavelengthNm: band.airNm,
        amplitudeCounts,
        fwhmNm: band.band.extentNm,
        lineId: band.id,
      });
    }
  }

  // A few weak unlisted impurity lines at random wavelengths.
  const impurityCount = Math.floor(random.uniform() * 4);
  for (let i = 0; i < impurityCount; i++) {
    const wavelengthNm = between(random, rangeNm[0], rangeNm[1]);
    lines.push({
      species: "unlisted",
      element: "impurity",
      wavelengthNm,
      amplitudeCounts: readNoiseCounts * between(random, 4, 20),
      fwhmNm: fwhmNmAt(wavelengthNm),
      lineId: null,
    });
  }

  // Counts: dark offset + continuum + lines + bands, then Poisson and read noise.
  const darkCounts = between(random, 100, 400);
  const temperatureK =
    source === "flame" ? between(random, 1900, 2800) : between(random, 4000, 6500);
  let continuumMax = 0;
  for (const nm of [rangeNm[0], rangeNm[1], 0.5 * (rangeNm[0] + rangeNm[1])]) {
    continuumMax = Math.max(continuumMax, planck(nm, temperatureK));
  }
  const continuumPeakCounts = logBetween(random, 20, 3000);
  const y = new Float64Array(pixelCount);
  for (let px = 0; px < pixelCount; px++) {
    y[px] = (continuumPeakCounts * planck(wavelengths[px], temperatureK)) / continuumMax;
  }
  for (const line of lines) {
    if (BAND_METAL[line.species]) continue;
    const centrePx = pixelOf(line.wavelengthNm);
    const sigmaPx =
      line.fwhmNm / Math.abs(dispersionNmPerPx(centrePx)) / (2 * Math.sqrt(2 * Math.log(2)));
    const reach = Math.ceil(6 * sigmaPx);
    for (
      let px = Math.max(0, Math.floor(centrePx) - reach);
      px <= Math.min(pixelCount - 1, Math.ceil(centrePx) + reach);
      px++
    ) {
      y[px] += line.amplitudeCounts * Math.exp(-0.5 * ((px - centrePx) / sigmaPx) ** 2);
    }
  }
  for (const band of bands) {
    // Exponential fade from the head over a third of the extent, blurred at the head by the instrument.
    const blurNm = fwhmNmAt(band.headNm);
    for (let px = 0; px < pixelCount; px++) {
      const awayNm = (band.toRed ? 1 : -1) * (wavelengths[px] - band.headNm);
      if (awayNm < -3 * blurNm || awayNm > band.extentNm) continue;
      const edge = 0.5 * (1 + Math.tanh(awayNm / (0.5 * blurNm)));
      y[px] += band.amplitudeCounts * edge * Math.exp(-Math.max(0, awayNm) / (band.extentNm / 3));
    }
  }
  for (let px = 0; px < pixelCount; px++) {
    y[px] = random.poisson(Math.max(0, y[px])) + darkCounts + readNoiseCounts * random.normal();
  }

  // A pixel axis carries a lamp calibration: a fit to the true dispersion at 30 lamp-like points
  // with 0.05 px of centroid scatter (a good lamp calibration, common practice).
  let calibration: CalibrationModel | null = null;
  let x: Float64Array;
  if (axis === "pixel") {
    x = Float64Array.from({ length: pixelCount }, (_, i) => i);
    const pairs = Array.from({ length: 30 }, (_, k) => {
      const px = 10 + ((pixelCount - 21) * (k + random.uniform() * 0.8)) / 30;
      const i = Math.floor(px);
      const wavelengthNm = wavelengths[i] + (wavelengths[i + 1] - wavelengths[i]) * (px - i);
      return { x: px + 0.05 * random.normal(), xUncertainty: 0.05, wavelengthNm };
    });
    // A grating's cubic; for a prism the model the workbench recommends from these pairs (a
    // polynomial cannot follow a prism's red end: degree 5 put lines there 4–6 nm off).
    const domain: [number, number] = [0, pixelCount - 1];
    if (instrument === "grating") {
      calibration = fitCalibration(pairs, { model: "polynomial", degree: 3, domain }).model;
    } else {
      const compared = compareCalibrationModels(pairs, { dispersion: "prism", domain });
      calibration =
        compared.candidates[compared.recommended]?.model ??
        fitCalibration(pairs, { model: "polynomial", degree: 5, domain }).model;
    }
  } else {
    x = wavelengths;
  }

  const resolution =
    instrument === "grating"
      ? { resolutionNm: gratingFwhmNm }
      : axis === "pixel"
        ? { resolutionPx: slitPx }
        : {};
  return {
    seed,
    x,
    y,
    source,
    instrument,
    axis,
    calibration,
    resolution,
    instrumentWidth:
      instrument === "grating" ? { fwhm: gratingFwhmNm, unit: "nm" } : { fwhm: slitPx, unit: "px" },
    readNoiseCounts,
    truth: {
      elements: [...elements].sort(),
      lines: lines.sort((a, b) => a.wavelengthNm - b.wavelengthNm),
      principalInRange,
      principalCounts,
      interference: interference?.name ?? null,
      rangeNm,
    },
  };
}
