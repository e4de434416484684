// Builds a synthetic emission spectrum with a known truth (lines, bands, continuum, noise, clipping)
// for tests, demo data and benchmarks across the project.

import { makeRandom } from "../statistics/make-random";
import { assertPositiveFinite } from "../units/assert-positive-finite";
import { assertFraction } from "../units/assert-fraction";
import { assertNonNegativeFinite } from "../units/assert-non-negative-finite";
import { scaledErfc } from "./scaled-erfc";

/** One emission line to draw. */
export interface SyntheticLine {
  /** Centre wavelength in nm. */
  wavelengthNm: number;
  /** Peak height above the continuum, in counts (before noise and clipping). */
  amplitude: number;
  /** Full width at half maximum in nm.
   * @default the instrument's `resolutionNm` */
  fwhmNm?: number;
  /** Line shape in pixel space.
   * @default "gaussian" */
  profile?: "gaussian" | "voigt-like";
}

/** One molecular band: a sharp head that fades away over its extent. */
export interface SyntheticBand {
  /** Wavelength of the band head in nm. */
  headNm: number;
  /** Width of the band from its head, in nm. */
  extentNm: number;
  /** Direction in which the band fades away from its head. */
  degradesTo: "red" | "violet";
  /** Intensity at the head before the instrument blurs it, in counts. */
  amplitude: number;
}

/** A broad continuum beneath the lines (a flame's glowing soot, a lamp's background). */
export type SyntheticContinuum =
  | {
      /** Planck-like hump λ⁻⁵/(exp(c₂/λT) − 1), scaled so its maximum in range is `peakCounts`. */
      shape: "planck";
      /** Temperature of the emitter in kelvin. */
      temperatureK: number;
      /** Counts at the hump's highest point within the range. */
      peakCounts: number;
    }
  | {
      /** Σ cᵢ uⁱ with u = (λ − λ_mid)/(half the span), so u runs from −1 to 1 over the range. */
      shape: "polynomial";
      /** Coefficients c₀, c₁, … in counts. */
      coefficients: number[];
    };

export interface SynthesizeSpectrumOptions {
  /** Number of detector pixels.
   * @default 2048 */
  pixelCount?: number;
  /** Wavelength in nm seen by pixel `px` (any strictly monotonic model: cubic grating, prism).
   * @default a linear 350–750 nm axis */
  wavelengthOfPixel?: (px: number) => number;
  /** Instrument resolution (FWHM of an unresolved line) in nm.
   * @default 1 */
  resolutionNm?: number;
  /** Emission lines to draw.
   * @default [] */
  lines?: SyntheticLine[];
  /** Molecular bands to draw.
   * @default [] */
  bands?: SyntheticBand[];
  /** Broad continuum beneath everything.
   * @default none */
  continuum?: SyntheticContinuum;
  /** Lorentzian share of the "voigt-like" (pseudo-Voigt) profile.
   * @default 0.3 */
  lorentzFraction?: number;
  /** Standard deviation of the Gaussian read noise, in counts.
   * @default 0 */
  readNoiseCounts?: number;
  /** Draw Poisson (shot) noise on the signal, one count per photo-electron.
   * @default false */
  shotNoise?: boolean;
  /** Constant offset (dark level) added to every pixel, in counts; it carries no shot noise,
   * as an electronic bias does not.
   * @default 0 */
  darkCounts?: number;
  /** Detector maximum: counts above it are clipped to it (saturation).
   * @default Infinity */
  saturationCounts?: number;
  /** Put the blue end at high pixel: pixel p then sees wavelengthOfPixel(N − 1 − p).
   * @default false */
  reverseAxis?: boolean;
  /** Seed of the noise stream.
   * @default 1 */
  seed?: number;
}

/** Where a drawn line landed on the detector. */
export interface SyntheticLineTruth {
  wavelengthNm: number;
  /** Sub-pixel position of the line centre. */
  pixel: number;
  amplitude: number;
  fwhmNm: number;
  fwhmPx: number;
}

/** Where a drawn band head landed on the detector. */
export interface SyntheticBandTruth {
  headNm: number;
  /** Sub-pixel position of the band head. */
  pixel: number;
  amplitude: number;
}

export interface SyntheticSpectrum {
  /** Pixel numbers 0 … N − 1. */
  x: Float64Array;
  /** Counts with noise, offset and clipping applied. */
  y: Float64Array;
  truth: {
    /** Wavelength in nm at each pixel. */
    wavelengthNmAtPixel: Float64Array;
    /** Lines that fall inside the range (lines outside it are left out entirely). */
    lines: SyntheticLineTruth[];
    /** Band heads that fall inside the range. */
    bands: SyntheticBandTruth[];
    /** The noiseless, unclipped signal without the dark level, in counts. */
    signal: Float64Array;
  };
}

// Second radiation constant c₂ = hc/k, CODATA 2018: 1.438776877e-2 m·K, here in nm·K.
const SECOND_RADIATION_CONSTANT_NM_K = 1.438776877e7;
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/**
 * Draws a spectrum on a detector of `pixelCount` pixels from known lines, bands and continuum.
 * Line widths are given in nm and converted to pixels through the local dispersion at each line,
 * because the instrument's line-spread function is what the detector samples; the profile is
 * then symmetric in pixels.
 */
export function synthesizeSpectrum(options: SynthesizeSpectrumOptions = {}): SyntheticSpectrum {
  const {
    pixelCount = 2048,
    wavelengthOfPixel = (px: number) => 350 + (400 * px) / (pixelCount - 1),
    resolutionNm = 1,
    lines = [],
    bands = [],
    continuum,
    lorentzFraction = 0.3,
    readNoiseCounts = 0,
    shotNoise = false,
    darkCounts = 0,
    saturationCounts = Infinity,
    reverseAxis = false,
    seed = 1,
  } = options;
  assertIntegerAtLeast("pixelCount", pixelCount, 3);
  assertPositiveFinite(resolutionNm, "resolutionNm");
  assertFraction(lorentzFraction, "lorentzFraction");
  assertNonNegativeFinite(readNoiseCounts, "readNoiseCounts");
  assertFinite("darkCounts", darkCounts);
  if (!(saturationCounts > 0)) {
    throw new RangeError(`saturationCounts must be > 0, got ${saturationCounts}`);
  }

  const wavelengthNmAtPixel = new Float64Array(pixelCount);
  for (let px = 0; px < pixelCount; px++) {
    wavelengthNmAtPixel[px] = wavelengthOfPixel(reverseAxis ? pixelCount - 1 - px : px);
  }
  assertStrictlyMonotonic(wavelengthNmAtPixel);

  const signal = new Float64Array(pixelCount);
  const lineTruth: SyntheticLineTruth[] = [];
  for (const line of lines) {
    assertPositiveFinite(line.wavelengthNm, "line.wavelengthNm");
    assertNonNegativeFinite(line.amplitude, "line.amplitude");
    const fwhmNm = line.fwhmNm ?? resolutionNm;
    assertPositiveFinite(fwhmNm, "line.fwhmNm");
    const pixel = pixelOfWavelength(wavelengthNmAtPixel, line.wavelengthNm);
    if (pixel === null) continue;
    const fwhmPx = fwhmNm / Math.abs(dispersionNmPerPx(wavelengthNmAtPixel, pixel));
    addLine(
      signal,
      pixel,
      line.amplitude,
      fwhmPx,
      line.profile === "voigt-like" ? lorentzFraction : 0,
    );
    lineTruth.push({
      wavelengthNm: line.wavelengthNm,
      pixel,
      amplitude: line.amplitude,
      fwhmNm,
      fwhmPx,
    });
  }

  const bandTruth: SyntheticBandTruth[] = [];
  for (const band of bands) {
    assertPositiveFinite(band.headNm, "band.headNm");
    assertPositiveFinite(band.extentNm, "band.extentNm");
    assertNonNegativeFinite(band.amplitude, "band.amplitude");
    const pixel = pixelOfWavelength(wavelengthNmAtPixel, band.headNm);
    if (pixel === null) continue;
    addBand(signal, wavelengthNmAtPixel, pixel, band, resolutionNm);
    bandTruth.push({ headNm: band.headNm, pixel, amplitude: band.amplitude });
  }

  if (continuum) addContinuum(signal, wavelengthNmAtPixel, continuum);

  const random = makeRandom(seed);
  const x = new Float64Array(pixelCount);
  const y = new Float64Array(pixelCount);
  for (let px = 0; px < pixelCount; px++) {
    x[px] = px;
    let counts = shotNoise ? random.poisson(Math.max(0, signal[px])) : signal[px];
    if (readNoiseCounts > 0) counts += readNoiseCounts * random.normal();
    y[px] = Math.min(saturationCounts, counts + darkCounts);
  }

  return {
    x,
    y,
    truth: { wavelengthNmAtPixel, lines: lineTruth, bands: bandTruth, signal },
  };
}

/** Sub-pixel position of a wavelength on a monotonic grid, or null when outside it. */
function pixelOfWavelength(grid: Float64Array, wavelengthNm: number): number | null {
  const last = grid.length - 1;
  const increasing = grid[last] > grid[0];
  const lowNm = increasing ? grid[0] : grid[last];
  const highNm = increasing ? grid[last] : grid[0];
  if (wavelengthNm < lowNm || wavelengthNm > highNm) return null;
  let lo = 0;
  let hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (grid[mid] < wavelengthNm === increasing) lo = mid;
    else hi = mid;
  }
  return lo + (wavelengthNm - grid[lo]) / (grid[hi] - grid[lo]);
}

/** Signed dλ/dpx at a sub-pixel position, from the neighbouring grid points. */
function dispersionNmPerPx(grid: Float64Array, pixel: number): number {
  const i = Math.min(grid.length - 2, Math.max(0, Math.floor(pixel)));
  return grid[i + 1] - grid[i];
}

function addLine(
  signal: Float64Array,
  centrePx: number,
  amplitude: number,
  fwhmPx: number,
  lorentzShare: number,
): void {
  // Gaussian wings vanish past ~6 FWHM; Lorentzian wings reach far, so draw them wider.
  const halfWindowPx = lorentzShare > 0 ? 200 * fwhmPx : 6 * fwhmPx;
  const from = Math.max(0, Math.floor(centrePx - halfWindowPx));
  const to = Math.min(signal.length - 1, Math.ceil(centrePx + halfWindowPx));
  const sigmaPx = fwhmPx / FWHM_PER_SIGMA;
  for (let px = from; px <= to; px++) {
    const offset = px - centrePx;
    const gaussian = Math.exp((-0.5 * offset * offset) / (sigmaPx * sigmaPx));
    const lorentzian = lorentzShare > 0 ? 1 / (1 + (4 * offset * offset) / (fwhmPx * fwhmPx)) : 0;
    signal[px] += amplitude * ((1 - lorentzShare) * gaussian + lorentzShare * lorentzian);
  }
}

/**
 * A band as a one-sided exponential from its head (falling to e⁻³ ≈ 5 % at the end of its extent,
 * where it is cut off) blurred by the instrument's Gaussian: an exponentially modified Gaussian,
 * minus a shifted copy for the cut-off. Drawn in pixels from the dispersion at the head.
 */
function addBand(
  signal: Float64Array,
  grid: Float64Array,
  headPx: number,
  band: SyntheticBand,
  resolutionNm: number,
): void {
  const dispersion = dispersionNmPerPx(grid, headPx);
  const nmPerPx = Math.abs(dispersion);
  const sigmaPx = resolutionNm / FWHM_PER_SIGMA / nmPerPx;
  const extentPx = band.extentNm / nmPerPx;
  const decayPx = extentPx / 3;
  // +1 when "into the band" runs towards higher pixel numbers.
  const intoBand = Math.sign(dispersion) * (band.degradesTo === "red" ? 1 : -1);
  const tailFactor = Math.exp(-extentPx / decayPx);
  for (let px = 0; px < signal.length; px++) {
    const depthPx = intoBand * (px - headPx);
    if (depthPx < -8 * sigmaPx || depthPx > extentPx + 8 * sigmaPx) continue;
    const value =
      exponentiallyModifiedGaussian(depthPx, sigmaPx, decayPx) -
      tailFactor * exponentiallyModifiedGaussian(depthPx - extentPx, sigmaPx, decayPx);
    signal[px] += band.amplitude * Math.max(0, value);
  }
}

/** ∫₀^∞ e^(−t/τ) N(x − t; σ) dt, which tends to 1 deep inside the band. */
function exponentiallyModifiedGaussian(x: number, sigma: number, tau: number): number {
  const z = (sigma / tau - x / sigma) / Math.SQRT2;
  if (z >= 0) {
    return 0.5 * Math.exp((-0.5 * x * x) / (sigma * sigma)) * scaledErfc(z);
  }
  const erfcOfZ = 2 - scaledErfc(-z) * Math.exp(-z * z);
  return 0.5 * Math.exp((0.5 * sigma * sigma) / (tau * tau) - x / tau) * erfcOfZ;
}

function addContinuum(
  signal: Float64Array,
  grid: Float64Array,
  continuum: SyntheticContinuum,
): void {
  const shape = new Float64Array(grid.length);
  if (continuum.shape === "planck") {
    assertPositiveFinite(continuum.temperatureK, "continuum.temperatureK");
    assertNonNegativeFinite(continuum.peakCounts, "continuum.peakCounts");
    let highest = 0;
    for (let px = 0; px < grid.length; px++) {
      const nm = grid[px];
      shape[px] =
        1 / (nm ** 5 * Math.expm1(SECOND_RADIATION_CONSTANT_NM_K / (nm * continuum.temperatureK)));
      highest = Math.max(highest, shape[px]);
    }
    const scale = highest > 0 ? continuum.peakCounts / highest : 0;
    for (let px = 0; px < grid.length; px++) signal[px] += scale * shape[px];
    return;
  }
  const first = grid[0];
  const last = grid[grid.length - 1];
  const middleNm = (first + last) / 2;
  const halfSpanNm = Math.abs(last - first) / 2;
  for (let px = 0; px < grid.length; px++) {
    const u = (grid[px] - middleNm) / halfSpanNm;
    let value = 0;
    for (let i = continuum.coefficients.length - 1; i >= 0; i--) {
      value = value * u + continuum.coefficients[i];
    }
    signal[px] += value;
  }
}

function assertStrictlyMonotonic(grid: Float64Array): void {
  const increasing = grid[1] > grid[0];
  for (let px = 0; px < grid.length; px++) {
    if (!Number.isFinite(grid[px]) || grid[px] <= 0) {
      throw new RangeError(
        `wavelengthOfPixel gave ${grid[px]} nm at pixel ${px}; expected a positive number`,
      );
    }
    if (px > 0 && grid[px] > grid[px - 1] !== increasing) {
      throw new RangeError(`wavelengthOfPixel must be strictly monotonic; it turns at pixel ${px}`);
    }
  }
}

function assertIntegerAtLeast(name: string, value: number, minimum: number): void {
  if (!Number.isInteger(value) || value < minimum) {
    throw new RangeError(`${name} must be an integer ≥ ${minimum}, got ${value}`);
  }
}

function assertFinite(name: string, value: number): void {
  if (!Number.isFinite(value)) {
    throw new RangeError(`${name} must be finite, got ${value}`);
  }
}
