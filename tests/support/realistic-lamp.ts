// A seeded generator of realistic lamp spectra with a known truth (pixel → wavelength), the measuring
// stick of automatic lamp calibration. It is its own code on purpose: it shares no dispersion,
// glass or line-drawing code with lib/spectrum, so a bug there cannot hide itself here.
//
// What a new user's instrument shows that a clean test lamp does not:
// - the lamp gases' lines of the starter table (every row of the element with a lamp intensity,
//   flagged or not: the lamp emits them whatever the table says), 0–30 % of them missing, their
//   heights scattered around the table's rough intensities;
// - many weaker lines the table does not list (a real lamp shows far more lines than any table);
// - gratings with straight or curved dispersion, prisms of several glasses (some outside the
//   project's glass catalogue), either direction of the axis;
// - a detector response curve, saturated strongest lines, hot pixels, Poisson and read noise, a dark
//   offset;
// - a stated nominal range off by up to ±3 % of the span at each end.
import fs from "node:fs";
import path from "node:path";
import { parseLineTableCsv, toReferenceLine } from "@/lib/lines";
import type { LampLine } from "@/lib/spectrum/calibration";
import { makeRandom } from "@/lib/spectrum/statistics/make-random";
import type { ReferenceLine } from "@/lib/spectrum/types";

/** Sellmeier coefficients n² − 1 = Σ Bᵢλ²/(λ² − Cᵢ), λ in µm, Cᵢ in µm². */
interface GeneratorGlass {
  b: [number, number, number];
  cUm2: [number, number, number];
  /** Shortest wavelength the generator uses the glass at, nm (well above its UV resonances). */
  minNm: number;
}

// Makers' published Sellmeier coefficients (typed from memory; each glass says its source).
export const GENERATOR_GLASSES: Record<string, GeneratorGlass> = {
  // SCHOTT optical glass data sheet N-BK7 (from memory).
  "N-BK7": {
    b: [1.03961212, 0.231792344, 1.01046945],
    cUm2: [0.00600069867, 0.0200179144, 103.560653],
    minNm: 300,
  },
  // SCHOTT optical glass data sheet F2 (from memory).
  F2: {
    b: [1.34533359, 0.209073176, 0.937357162],
    cUm2: [0.00997743871, 0.0470450767, 111.886764],
    minNm: 330,
  },
  // SCHOTT optical glass data sheet N-SF11 (from memory).
  "N-SF11": {
    b: [1.73759695, 0.313747346, 1.89878101],
    cUm2: [0.013188707, 0.0623068142, 155.23629],
    minNm: 380,
  },
  // SCHOTT optical glass data sheet SF10 (the lead-containing SF10, not N-SF10; from memory).
  SF10: {
    b: [1.61625977, 0.259229334, 1.07762317],
    cUm2: [0.0127534559, 0.0581983954, 116.60768],
    minNm: 380,
  },
  // SCHOTT optical glass data sheet N-BAK4 (from memory).
  "N-BAK4": {
    b: [1.28834642, 0.132817724, 0.945395373],
    cUm2: [0.00779980626, 0.0315631177, 105.965875],
    minNm: 320,
  },
  // SCHOTT optical glass data sheet N-SF6 (from memory).
  "N-SF6": {
    b: [1.77931763, 0.338149866, 2.08734474],
    cUm2: [0.0133714182, 0.0617533621, 174.01759],
    minNm: 390,
  },
  // SCHOTT optical glass data sheet N-LASF9 (from memory).
  "N-LASF9": {
    b: [2.00029547, 0.298926886, 1.80691843],
    cUm2: [0.0121426017, 0.0538736236, 156.530829],
    minNm: 380,
  },
  // Fused silica: I. H. Malitson, J. Opt. Soc. Am. 55, 1205 (1965) (from memory).
  "fused-silica": {
    b: [0.6961663, 0.4079426, 0.8974794],
    cUm2: [0.0684043 ** 2, 0.1162414 ** 2, 9.896161 ** 2],
    minNm: 220,
  },
  // CaF₂: I. H. Malitson, Appl. Opt. 2, 1103 (1963) (from memory).
  CaF2: {
    b: [0.5675888, 0.4710914, 3.8484723],
    cUm2: [0.050263605 ** 2, 0.1003909 ** 2, 34.64904 ** 2],
    minNm: 220,
  },
  // Sapphire, ordinary ray: I. H. Malitson and M. J. Dodge, J. Opt. Soc. Am. 62, 1405 (1972) (from memory).
  sapphire: {
    b: [1.4313493, 0.65054713, 5.3414021],
    cUm2: [0.0726631 ** 2, 0.1193242 ** 2, 18.028251 ** 2],
    minNm: 230,
  },
};

function sellmeierIndex(glass: GeneratorGlass, wavelengthNm: number): number {
  const l2 = (wavelengthNm / 1000) ** 2;
  let sum = 0;
  for (let i = 0; i < 3; i++) sum += (glass.b[i] * l2) / (l2 - glass.cUm2[i]);
  return Math.sqrt(1 + sum);
}

function gaussian(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

function poisson(random: () => number, mean: number): number {
  if (mean <= 0) return 0;
  if (mean > 50) return Math.max(0, Math.round(mean + Math.sqrt(mean) * gaussian(random)));
  const limit = Math.exp(-mean);
  let k = 0;
  let p = random();
  while (p > limit) {
    k++;
    p *= random();
  }
  return k;
}

const pick = <T>(random: () => number, items: readonly T[]): T =>
  items[Math.floor(random() * items.length)];
const between = (random: () => number, low: number, high: number) => low + (high - low) * random();

const starterCsv = fs.readFileSync(
  path.resolve(__dirname, "../../db/lines/starter-lines.csv"),
  "utf8",
);
/** The starter table as the core sees it. */
export const STARTER_TABLE: ReferenceLine[] = parseLineTableCsv(starterCsv).rows.map((row, i) =>
  toReferenceLine(row, `row-${i}`),
);

/** Lamp gases (element symbols) of the sweep's lamps. */
export const LAMP_MIXES: readonly (readonly string[])[] = [
  ["Hg"],
  ["Ne"],
  ["Ar"],
  ["Hg", "Ar"],
  ["Ne", "Ar"],
  ["Kr"],
  ["Xe"],
  ["He"],
  ["Hg", "Ne"],
];

/** The lamp lines the app hands to calibration: lamp-flagged lines of the gases inside [low, high] (as the service selects them). */
export function tableLampLines(gases: readonly string[], rangeNm: [number, number]): LampLine[] {
  return STARTER_TABLE.filter(
    (l) =>
      l.flags.lamp && gases.includes(l.element) && l.airNm >= rangeNm[0] && l.airNm <= rangeNm[1],
  ).map((l) => ({
    wavelengthNm: l.airNm,
    intensity: l.intensities.lamp ?? 1,
    species: l.species,
    id: l.id,
  }));
}

export type RealisticDispersion = "grating-straight" | "grating-curved" | "prism";

export interface RealisticLampOptions {
  /** Force the dispersion family. */
  dispersion?: RealisticDispersion;
  /** Force the lamp gases. */
  gases?: readonly string[];
  /** Force the prism's glass (a key of GENERATOR_GLASSES). */
  glass?: string;
  /** Only the table's lamp-flagged lines, none missing, no unlisted lines, the exact range (the easy case). */
  clean?: boolean;
  /** Pixels of the array. @default 2048 or 3648 at random */
  pixels?: number;
  /** Force the true range [low, high] nm of the array. */
  rangeNm?: [number, number];
  /** Force the axis direction (1: blue at low pixels). */
  direction?: 1 | -1;
}

/** What happened to an instrument between two recordings: a day's drift, or a realignment. */
export type RecordingChange = "day" | "realignment";

export interface RealisticLamp {
  seed: number;
  x: Float64Array;
  y: Float64Array;
  /** Truth: wavelength in nm seen by pixel px. */
  wavelengthAt: (px: number) => number;
  /** Truth: local FWHM of a line in nm at pixel px. */
  fwhmNmAt: (px: number) => number;
  dispersion: RealisticDispersion;
  glass: string | null;
  gases: readonly string[];
  /** The nominal range the user states (off by up to ±3 % of the span at each end). */
  statedRangeNm: [number, number];
  /** The true range of the array, [low, high] nm. */
  trueRangeNm: [number, number];
  /** The stated resolution (FWHM) in nm at the mean dispersion. */
  resolutionNm: number;
  /** The lines the app would hand to calibration (lamp-flagged lines of the gases in the stated range). */
  lines: LampLine[];
  /** Lamp-flagged table lines of the gases inside the true range. */
  tableLinesInRange: number;
  /** What else the spectrum holds, for diagnosis. */
  unlistedLineCount: number;
  missingFraction: number;
  saturatedLines: number;
  hotPixels: number;
  /**
   * The same instrument recorded again, fresh noise: another day (a shift of up to ±3 px and a stretch
   * of up to ±0.3 %), or after a realignment (a shift of 1.2–3 % of the array either way and a stretch of
   * up to ±1 %).
   */
  rerecord: (seed: number, change?: RecordingChange) => RealisticLamp;
}

interface Axis {
  /** Pixel → wavelength (nm). */
  at: (px: number) => number;
  /** Local FWHM in nm at a pixel. */
  fwhmNmAt: (px: number) => number;
}

/** A prism near minimum deviation imaged by a camera: x = a + b·tan(δ(λ) − δc). Inverse by a dense table. */
function prismAxis(
  glass: GeneratorGlass,
  lowNm: number,
  highNm: number,
  pixels: number,
  slitPx: number,
  direction: 1 | -1,
  axisOffset: number,
): Axis {
  const apex = Math.PI / 3;
  const middle = Math.sqrt(lowNm * highNm);
  const nMid = sellmeierIndex(glass, middle);
  const incidence = Math.asin(Math.min(0.999, nMid * Math.sin(apex / 2)));
  const deviation = (lambda: number) => {
    const n = sellmeierIndex(glass, lambda);
    const inside1 = Math.asin(Math.sin(incidence) / n);
    const inside2 = apex - inside1;
    return incidence + Math.asin(Math.min(1, n * Math.sin(inside2))) - apex;
  };
  const centre = deviation(middle) + axisOffset;
  const u = (lambda: number) => Math.tan(centre - deviation(lambda));
  // Scale so the ends of [low, high] land on the array's ends.
  const uLow = u(lowNm);
  const uHigh = u(highNm);
  const grid = 8192;
  const wl = new Float64Array(grid + 1);
  const xs = new Float64Array(grid + 1);
  for (let i = 0; i <= grid; i++) {
    const lambda = lowNm * (highNm / lowNm) ** (i / grid);
    wl[i] = lambda;
    const t = (u(lambda) - uLow) / (uHigh - uLow);
    xs[i] = direction === 1 ? t * (pixels - 1) : (1 - t) * (pixels - 1);
  }
  const rising = direction === 1;
  const at = (px: number) => {
    // xs is monotonic in i (rising or falling with direction).
    let lo = 0;
    let hi = grid;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (xs[mid] < px === rising) lo = mid;
      else hi = mid;
    }
    const f = (px - xs[lo]) / (xs[hi] - xs[lo] || 1);
    return wl[lo] + f * (wl[hi] - wl[lo]);
  };
  return { at, fwhmNmAt: (px) => slitPx * Math.abs(at(px + 0.5) - at(px - 0.5)) };
}

/** A grating: λ = low + span·v(t), t = 0…1 along the array, v straight or curved (quadratic + cubic). */
function gratingAxis(
  lowNm: number,
  highNm: number,
  pixels: number,
  k2: number,
  k3: number,
  direction: 1 | -1,
  fwhmNm: number,
): Axis {
  const span = highNm - lowNm;
  return {
    at: (px) => {
      const t0 = px / (pixels - 1);
      const t = direction === 1 ? t0 : 1 - t0;
      return lowNm + span * (t + k2 * (t * t - t) + k3 * (t * t * t - t));
    },
    fwhmNmAt: () => fwhmNm,
  };
}

interface EmittedLine {
  wavelengthNm: number;
  amplitude: number;
}

/** Pixel of a wavelength on a monotonic axis, by bisection. */
function pixelOf(axis: Axis, pixels: number, wavelengthNm: number): number {
  let lo = 0;
  let hi = pixels - 1;
  const rising = axis.at(hi) > axis.at(lo);
  for (let k = 0; k < 50; k++) {
    const mid = (lo + hi) / 2;
    if (axis.at(mid) < wavelengthNm === rising) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

interface Design {
  seed: number;
  pixels: number;
  axis: Axis;
  dispersion: RealisticDispersion;
  glass: string | null;
  gases: readonly string[];
  trueRangeNm: [number, number];
  statedRangeNm: [number, number];
  resolutionNm: number;
  emitted: EmittedLine[];
  response: (lambda: number) => number;
  saturationCounts: number;
  saturatedLines: number;
  hotPixelCount: number;
  readNoise: number;
  dark: number;
  missingFraction: number;
  unlistedLineCount: number;
  tableLinesInRange: number;
  /** Builds the axis again with a small change (for re-recording). */
  remake: (shiftPx: number, stretch: number) => Axis;
}

function render(
  design: Design,
  noiseSeed: number,
): { x: Float64Array; y: Float64Array; hot: number } {
  const random = makeRandom(noiseSeed).uniform;
  const { pixels, axis } = design;
  const clean = new Float64Array(pixels);
  for (const line of design.emitted) {
    const centre = pixelOf(axis, pixels, line.wavelengthNm);
    if (centre < -20 || centre > pixels + 20) continue;
    const px = Math.min(Math.max(Math.round(centre), 1), pixels - 2);
    const dispersion = Math.abs(axis.at(px + 0.5) - axis.at(px - 0.5));
    const sigmaPx = axis.fwhmNmAt(px) / dispersion / 2.3548;
    const height = line.amplitude * design.response(line.wavelengthNm);
    const reach = Math.ceil(5 * sigmaPx);
    for (
      let i = Math.max(0, Math.floor(centre) - reach);
      i <= Math.min(pixels - 1, Math.ceil(centre) + reach);
      i++
    ) {
      // Pixel-integrated Gaussian (the centre of a pixel sample is its mean over the pixel) via the midpoint rule.
      let s = 0;
      for (const d of [-0.375, -0.125, 0.125, 0.375])
        s += Math.exp(-0.5 * ((i + d - centre) / sigmaPx) ** 2);
      clean[i] += (height * s) / 4;
    }
  }
  const y = new Float64Array(pixels);
  // A weak continuum under the lines (the lamp's glow and stray light), shaped by the response.
  for (let i = 0; i < pixels; i++) {
    const background = 20 * design.response(axis.at(i));
    const signal = poisson(random, clean[i] + background);
    y[i] = Math.min(
      design.saturationCounts,
      design.dark + signal + design.readNoise * gaussian(random),
    );
  }
  for (let h = 0; h < design.hotPixelCount; h++) {
    const i = Math.floor(random() * pixels);
    y[i] = Math.min(
      design.saturationCounts,
      y[i] + between(random, 0.1, 1) * design.saturationCounts,
    );
  }
  return { x: Float64Array.from({ length: pixels }, (_, i) => i), y, hot: design.hotPixelCount };
}

function toLamp(design: Design, noiseSeed: number): RealisticLamp {
  const { x, y, hot } = render(design, noiseSeed);
  return {
    seed: design.seed,
    x,
    y,
    wavelengthAt: design.axis.at,
    fwhmNmAt: design.axis.fwhmNmAt,
    dispersion: design.dispersion,
    glass: design.glass,
    gases: design.gases,
    statedRangeNm: design.statedRangeNm,
    trueRangeNm: design.trueRangeNm,
    resolutionNm: design.resolutionNm,
    lines: tableLampLines(design.gases, design.statedRangeNm),
    tableLinesInRange: design.tableLinesInRange,
    unlistedLineCount: design.unlistedLineCount,
    missingFraction: design.missingFraction,
    saturatedLines: design.saturatedLines,
    hotPixels: hot,
    rerecord: (seed: number, change: RecordingChange = "day") => {
      const random = makeRandom(seed ^ 0x5bd1e995).uniform;
      // Another day: the axis moves by up to ±3 px and stretches by up to ±0.3 % (temperature). A
      // realignment (a knock, a serviced mount) moves it by 1.2–3 % of the array, beyond a day's 1 %
      // (recalibration-limits.ts), and stretches it by up to ±1 %.
      const axis =
        change === "day"
          ? design.remake(between(random, -3, 3), 1 + between(random, -0.003, 0.003))
          : design.remake(
              (random() < 0.5 ? -1 : 1) * between(random, 0.012, 0.03) * design.pixels,
              1 + between(random, -0.01, 0.01),
            );
      const lo = axis.at(0);
      const hi = axis.at(design.pixels - 1);
      return toLamp({ ...design, axis, trueRangeNm: [Math.min(lo, hi), Math.max(lo, hi)] }, seed);
    },
  };
}

/** The instrument and lamp of `seed`, recorded once. */
export function realisticLamp(seed: number, options: RealisticLampOptions = {}): RealisticLamp {
  const random = makeRandom(seed * 7919 + 17).uniform;
  const clean = options.clean ?? false;
  const pixels = options.pixels ?? (random() < 0.7 ? 2048 : 3648);
  const dispersion: RealisticDispersion =
    options.dispersion ??
    (random() < 0.3 ? "grating-straight" : random() < 0.55 ? "grating-curved" : "prism");
  const gases = options.gases ?? pick(random, LAMP_MIXES);
  const drawnDirection: 1 | -1 = random() < 0.8 ? 1 : -1;
  const direction = options.direction ?? drawnDirection;
  let axisFor: (shiftPx: number, stretch: number) => Axis;
  let glass: string | null = null;
  let lowNm: number;
  let highNm: number;
  let resolutionNm: number;
  if (dispersion === "prism") {
    glass = options.glass ?? pick(random, Object.keys(GENERATOR_GLASSES));
    const g = GENERATOR_GLASSES[glass];
    lowNm = Math.max(g.minNm, between(random, 230, 420));
    highNm = Math.min(1000, lowNm + between(random, 250, 600));
    if (options.rangeNm) [lowNm, highNm] = options.rangeNm;
    const slitPx = between(random, 2.5, 5);
    const axisOffset = between(random, -0.01, 0.01);
    axisFor = (shiftPx, stretch) => {
      const base = prismAxis(g, lowNm, highNm, pixels, slitPx, direction, axisOffset);
      const mid = (pixels - 1) / 2;
      const map = (px: number) => mid + (px - mid) * stretch + shiftPx;
      return { at: (px) => base.at(map(px)), fwhmNmAt: (px) => base.fwhmNmAt(map(px)) };
    };
    resolutionNm = (slitPx * (highNm - lowNm)) / pixels;
  } else {
    lowNm = between(random, 300, 550);
    highNm = Math.min(1000, lowNm + between(random, 180, 600));
    if (options.rangeNm) [lowNm, highNm] = options.rangeNm;
    const fwhmPx = between(random, 2.5, 6);
    resolutionNm = (fwhmPx * (highNm - lowNm)) / pixels;
    const k2 = dispersion === "grating-curved" ? between(random, -0.12, 0.12) : 0;
    const k3 = dispersion === "grating-curved" ? between(random, -0.05, 0.05) : 0;
    axisFor = (shiftPx, stretch) => {
      const base = gratingAxis(lowNm, highNm, pixels, k2, k3, direction, resolutionNm);
      const mid = (pixels - 1) / 2;
      return { at: (px) => base.at(mid + (px - mid) * stretch + shiftPx), fwhmNmAt: base.fwhmNmAt };
    };
  }
  const axis = axisFor(0, 1);
  const trueRangeNm: [number, number] = [lowNm, highNm];
  const span = highNm - lowNm;
  const statedRangeNm: [number, number] = clean
    ? [lowNm, highNm]
    : [
        Math.round(lowNm + between(random, -0.03, 0.03) * span),
        Math.round(highNm + between(random, -0.03, 0.03) * span),
      ];

  // The lamp: every line of the gases' elements with a lamp intensity (the lamp emits them whatever the
  // table flags), less the missing ones, plus lines the table does not list.
  const own = STARTER_TABLE.filter(
    (l) =>
      gases.includes(l.element) &&
      (clean ? l.flags.lamp : (l.intensities.lamp ?? 0) > 0) &&
      l.airNm >= lowNm - 5 &&
      l.airNm <= highNm + 5,
  );
  const missingFraction = clean ? 0 : between(random, 0, 0.3);
  const emitted: EmittedLine[] = [];
  for (const line of own) {
    if (random() < missingFraction) continue;
    // Table intensities are rough (a factor of ~2 either way, common practice) and lamps differ.
    const scatter = clean ? 1 : Math.exp(0.6 * gaussian(random));
    emitted.push({ wavelengthNm: line.airNm, amplitude: (line.intensities.lamp ?? 1) * scatter });
  }
  const strongest = Math.max(1, ...emitted.map((l) => l.amplitude));
  const unlistedLineCount = clean
    ? 0
    : Math.round(between(random, 0.5, 3) * Math.max(own.length, 10));
  for (let k = 0; k < unlistedLineCount; k++) {
    emitted.push({
      wavelengthNm: between(random, lowNm - 5, highNm + 5),
      amplitude: strongest * 10 ** between(random, -2.7, -0.8),
    });
  }
  // A silicon detector's response: highest near 600–700 nm, falling to a few tenths in the blue and near IR.
  const peakNm = between(random, 550, 750);
  const widthNm = between(random, 250, 450);
  const response = (lambda: number) =>
    0.15 + 0.85 * Math.exp(-0.5 * ((lambda - peakNm) / widthNm) ** 2);
  // Counts: the strongest line reaches 5000–60000 counts before saturation.
  const scale = between(random, 5000, 60000) / strongest;
  for (const line of emitted) line.amplitude *= scale;
  const dark = Math.round(between(random, 100, 1000));
  const heights = emitted
    .filter((l) => l.wavelengthNm >= lowNm && l.wavelengthNm <= highNm)
    .map((l) => l.amplitude * response(l.wavelengthNm))
    .sort((a, b) => b - a);
  // Half the lamps saturate their 1–4 strongest lines; the others stay below the detector's full scale.
  let saturationCounts = 65535;
  let saturatedLines = 0;
  if (!clean && random() < 0.5 && heights.length > 5) {
    saturatedLines = 1 + Math.floor(random() * 4);
    saturationCounts = dark + 0.9 * heights[saturatedLines - 1] * 0.9;
  }
  const hotPixelCount = clean ? 0 : Math.floor(random() * 7);
  const design: Design = {
    seed,
    pixels,
    axis,
    dispersion,
    glass,
    gases,
    trueRangeNm,
    statedRangeNm,
    resolutionNm,
    emitted,
    response,
    saturationCounts: Math.max(saturationCounts, dark + 200),
    saturatedLines,
    hotPixelCount,
    readNoise: between(random, 3, 15),
    dark,
    missingFraction,
    unlistedLineCount,
    tableLinesInRange: tableLampLines(gases, trueRangeNm).length,
    remake: axisFor,
  };
  return toLamp(design, seed * 31 + 5);
}
