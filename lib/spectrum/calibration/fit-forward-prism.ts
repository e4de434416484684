// Fast fit of the physical prism model of one catalogue glass run forwards, x(λ), used while pairing a
// prism: with the incidence fixed, x is a straight line in tan(δref − δ(λ)), so the camera scale and axis
// are solved in closed form and only the incidence is searched (a scan, then golden-section search).
// About a thousand times cheaper than fitPrismModel, which also inverts the model for residuals in nm.
import { CalibrationError } from "./calibration-error";
import type { GlassName } from "./glass-catalogue";
import { jacobianCovariance } from "./jacobian-covariance";
import type { ForwardHartmannPoint } from "./fit-forward-hartmann";
import { prismDeviationRad } from "./prism-forward";
import { refractiveIndex } from "./refractive-index";

const DEG = Math.PI / 180;

export interface FitForwardPrismOptions {
  /**
   * Apex angle of the prism, degrees (fixed, as in the calibration's prism model).
   * @default 60
   */
  apexDeg?: number;
  /**
   * Wavelength whose ray defines the camera axis, nm.
   * @default the middle of the pairs' wavelength range (as fitPrismModel takes it)
   */
  referenceWavelengthNm?: number;
}

/** A forward prism fit of one glass: χ², and x with its prediction interval at any λ. */
export interface ForwardPrismFit {
  glass: GlassName;
  /** [incidence (rad), slope b (x units per unit tan, signed by the axis direction), axis a (x units)]. */
  parameters: number[];
  chiSquare: number;
  dof: number;
  /** x at λ; NaN where the glass has no index or the ray cannot leave the prism. */
  predictX: (wavelengthNm: number) => number;
  /**
   * 1σ of a new observation at λ: sqrt(s²·(g·C·gᵀ + σpeak²)) with s² = max(1, χ²/dof), as the forward
   * Hartmann fit gives it.
   */
  predictionSigmaX: (wavelengthNm: number, peakSigmaX?: number) => number;
}

/** n(λ) of a glass, NaN beyond its Sellmeier resonances. */
function indexOrNaN(glass: GlassName, wavelengthNm: number): number {
  try {
    return refractiveIndex(glass, wavelengthNm);
  } catch {
    return Number.NaN;
  }
}

/** Fits x = a + b·tan(δ(n_ref) − δ(n(λ))) for one glass; throws CalibrationError when no geometry fits. */
export function fitForwardPrism(points: readonly ForwardHartmannPoint[], glass: GlassName, options: FitForwardPrismOptions = {}): ForwardPrismFit {
  if (!Array.isArray(points) || points.length < 4) {
    throw new RangeError(`points must hold at least 4 pairs (3 parameters + 1), got ${points?.length}`);
  }
  const apexDeg = options.apexDeg ?? 60;
  if (!(apexDeg > 0 && apexDeg < 90)) throw new RangeError(`apexDeg must be in (0, 90), got ${apexDeg}`);
  const apexRad = apexDeg * DEG;
  const x = points.map((p) => p.x);
  const sigma = points.map((p) => p.xUncertainty ?? 1);
  const lambda = points.map((p) => p.wavelengthNm);
  const referenceNm = options.referenceWavelengthNm ?? (Math.min(...lambda) + Math.max(...lambda)) / 2;
  const nReference = indexOrNaN(glass, referenceNm);
  const nOfPair = lambda.map((l) => indexOrNaN(glass, l));
  if (!Number.isFinite(nReference) || !nOfPair.every(Number.isFinite)) {
    throw new CalibrationError("fit-failed", `${glass}: a pair's wavelength lies beyond the glass's Sellmeier range`);
  }
  const tangentOf = (n: number, incidence: number, reference = prismDeviationRad(nReference, incidence, apexRad)) =>
    Math.tan(reference - prismDeviationRad(n, incidence, apexRad));
  /** The weighted straight line of x in u = tan(…) at one incidence: the profile of χ² over the incidence. */
  const profile = (incidence: number) => {
    let sw = 0, su = 0, sx = 0, suu = 0, sux = 0;
    const u: number[] = [];
    const reference = prismDeviationRad(nReference, incidence, apexRad);
    for (let i = 0; i < x.length; i++) {
      const value = tangentOf(nOfPair[i], incidence, reference);
      if (!Number.isFinite(value)) return { chiSquare: Infinity, a: 0, b: 0 };
      const w = 1 / sigma[i] ** 2;
      u.push(value);
      sw += w; su += w * value; sx += w * x[i]; suu += w * value * value; sux += w * value * x[i];
    }
    const determinant = sw * suu - su * su;
    if (!(determinant > 0)) return { chiSquare: Infinity, a: 0, b: 0 };
    const b = (sw * sux - su * sx) / determinant;
    const a = (sx - b * su) / sw;
    let chiSquare = 0;
    for (let i = 0; i < x.length; i++) chiSquare += ((x[i] - a - b * u[i]) / sigma[i]) ** 2;
    return { chiSquare, a, b };
  };

  // The profile is smooth but not convex over the whole scan (rays graze the faces at its ends), so a
  // scan around minimum deviation brackets the minimum before the golden-section search.
  const minimumDeviation = Math.asin(Math.min(nReference * Math.sin(apexRad / 2), 1));
  const stepRad = 0.5 * DEG;
  let bestIncidence = Number.NaN;
  let bestChiSquare = Infinity;
  for (let offsetDeg = -25; offsetDeg <= 35; offsetDeg += 0.5) {
    const incidence = minimumDeviation + offsetDeg * DEG;
    if (incidence <= 0 || incidence >= Math.PI / 2) continue;
    const { chiSquare } = profile(incidence);
    if (chiSquare < bestChiSquare) {
      bestChiSquare = chiSquare;
      bestIncidence = incidence;
    }
  }
  if (!Number.isFinite(bestChiSquare)) {
    throw new CalibrationError("fit-failed", `${glass}: no prism geometry passes all the pairs' wavelengths`);
  }
  const ratio = (Math.sqrt(5) - 1) / 2;
  let low = Math.max(bestIncidence - stepRad, 1e-3);
  let high = Math.min(bestIncidence + stepRad, Math.PI / 2 - 1e-3);
  let left = high - ratio * (high - low);
  let right = low + ratio * (high - low);
  let chiLeft = profile(left).chiSquare;
  let chiRight = profile(right).chiSquare;
  while (high - low > 1e-10) {
    if (chiLeft < chiRight) {
      high = right;
      right = left;
      chiRight = chiLeft;
      left = high - ratio * (high - low);
      chiLeft = profile(left).chiSquare;
    } else {
      low = left;
      left = right;
      chiLeft = chiRight;
      right = low + ratio * (high - low);
      chiRight = profile(right).chiSquare;
    }
  }
  const incidence = (low + high) / 2;
  const { chiSquare, a, b } = profile(incidence);
  if (!Number.isFinite(chiSquare) || b === 0) {
    throw new CalibrationError("fit-failed", `${glass}: the prism fit did not converge`);
  }

  const h = 1e-7;
  /** Gradient of x(λ) in (incidence, b, a) for a glass index n. */
  const gradient = (n: number) => {
    const u = tangentOf(n, incidence);
    const slope = (tangentOf(n, incidence + h) - tangentOf(n, incidence - h)) / (2 * h);
    return [b * slope, u, 1];
  };
  const covariance = jacobianCovariance(nOfPair.map((n, i) => gradient(n).map((g) => g / sigma[i])));
  const dof = x.length - 3;
  const varianceFactor = dof > 0 ? Math.max(1, chiSquare / dof) : 1;
  const predictX = (wavelengthNm: number) => a + b * tangentOf(indexOrNaN(glass, wavelengthNm), incidence);
  return {
    glass,
    parameters: [incidence, b, a],
    chiSquare,
    dof,
    predictX,
    predictionSigmaX: (wavelengthNm, peakSigmaX = 1) => {
      const g = gradient(indexOrNaN(glass, wavelengthNm));
      if (!g.every(Number.isFinite)) return Number.NaN;
      let variance = 0;
      for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) variance += g[j] * covariance[j][k] * g[k];
      return Math.sqrt(varianceFactor * (variance + peakSigmaX ** 2));
    },
  };
}
