// Fast fit of the physical prism model of one catalogue glass run forwards, x(λ), used while pairing a
// prism and as the start of fitPrismModel: with the incidence and the camera axis angle fixed, x is a
// straight line in the camera tangent of δref − δ(λ), so the camera scale and axis are solved in closed
// form; the incidence is searched (a scan, then Brent's method) with the camera on the reference
// ray, then the incidence and the axis angle are polished together by Gauss–Newton steps.
// Far cheaper than fitPrismModel, which also inverts the model for residuals in nm.
import { CalibrationError } from "./calibration-error";
import type { GlassName } from "./glass-catalogue";
import { jacobianCovariance } from "./jacobian-covariance";
import type { ForwardHartmannPoint } from "./fit-forward-hartmann";
import { brentMinimum } from "./brent-minimum";
import { cameraTangent, prismDeviationRad } from "./prism-forward";
import { refractiveIndex } from "./refractive-index";
import { dampedStep, lineProjection, twoParameterNormal, weightedLine } from "./weighted-line";

const DEG = Math.PI / 180;

export interface FitForwardPrismOptions {
  /**
   * Apex angle of the prism, degrees (fixed, as in the calibration's prism model).
   * @default 60
   */
  apexDeg?: number;
  /**
   * Wavelength whose ray lands on the fitted axis position a (and, when the axis angle is not fitted,
   * runs along the camera axis), nm.
   * @default the middle of the pairs' wavelength range (as fitPrismModel takes it)
   */
  referenceWavelengthNm?: number;
  /**
   * Fit the camera axis angle φ (deviation of the camera axis minus that of the reference ray). A real
   * camera looks wherever it was mounted; with φ pinned at 0 a wide range bends by pixels in the blue.
   * @default true
   */
  fitAxisAngle?: boolean;
  /**
   * Incidence (rad) of an earlier fit of nearly the same pairs: the search brackets the χ² minimum
   * there when it is lower than its neighbours half a degree away, else scans 3° either side, and
   * scans the whole range only when the minimum lies at the edge of that window.
   * @default undefined (the whole range is scanned)
   */
  startIncidenceRad?: number;
}

/** A forward prism fit of one glass: χ², and x with its prediction interval at any λ. */
export interface ForwardPrismFit {
  glass: GlassName;
  /**
   * [incidence (rad), slope b (x units per unit tangent, signed by the axis direction), axis a (x units)],
   * then the camera axis angle φ (rad) when it was fitted.
   */
  parameters: number[];
  chiSquare: number;
  dof: number;
  /** x at λ; NaN where the glass has no index or the ray cannot leave the prism. */
  predictX: (wavelengthNm: number) => number;
  /**
   * 1σ of a new observation at λ: sqrt(s²·(g·C·gᵀ + σpeak²)) with s² = max(1, χ²/dof), as the forward
   * Hartmann fit gives it; NaN where the glass has no index, or when the pairs do not determine the
   * parameters.
   */
  predictionSigmaX: (wavelengthNm: number, peakSigmaX?: number) => number;
  /**
   * Whether the pairs determine the parameters (the Jacobian is not singular). Worked out, with the
   * covariance, on first asking: most fits are only ranked by χ².
   */
  determined: () => boolean;
}

/** n(λ) of a glass, NaN beyond its Sellmeier resonances. */
function indexOrNaN(glass: GlassName, wavelengthNm: number): number {
  try {
    return refractiveIndex(glass, wavelengthNm);
  } catch {
    return Number.NaN;
  }
}

/** Largest camera axis angle searched, rad: far beyond any camera that still sees the spectrum. */
export const MAX_AXIS_ANGLE_RAD = 0.5;

/**
 * Fits x = a + b·(tan(δ(n_ref) − δ(n(λ)) + φ) − tan φ) for one glass (φ = 0 unless fitted); throws
 * CalibrationError when no geometry fits.
 */
export function fitForwardPrism(
  points: readonly ForwardHartmannPoint[],
  glass: GlassName,
  options: FitForwardPrismOptions = {},
): ForwardPrismFit {
  const fitAxisAngle = options.fitAxisAngle ?? true;
  const parameterCount = fitAxisAngle ? 4 : 3;
  if (!Array.isArray(points) || points.length < parameterCount + 1) {
    throw new RangeError(
      `points must hold at least ${parameterCount + 1} pairs (${parameterCount} parameters + 1), got ${points?.length}`,
    );
  }
  const apexDeg = options.apexDeg ?? 60;
  if (!(apexDeg > 0 && apexDeg < 90))
    throw new RangeError(`apexDeg must be in (0, 90), got ${apexDeg}`);
  const apexRad = apexDeg * DEG;
  const x = points.map((p) => p.x);
  const sigma = points.map((p) => p.xUncertainty ?? 1);
  const lambda = points.map((p) => p.wavelengthNm);
  const referenceNm =
    options.referenceWavelengthNm ?? (Math.min(...lambda) + Math.max(...lambda)) / 2;
  const nReference = indexOrNaN(glass, referenceNm);
  const nOfPair = lambda.map((l) => indexOrNaN(glass, l));
  if (!Number.isFinite(nReference) || !nOfPair.every(Number.isFinite)) {
    throw new CalibrationError(
      "fit-failed",
      `${glass}: a pair's wavelength lies beyond the glass's Sellmeier range`,
    );
  }
  /**
   * δref − δ(n) as a function of n at one incidence, the incidence's own terms (its sine, the reference
   * ray's deviation) worked out once: the fit and its predictions ask about many n at each incidence.
   */
  const anglesAt = (incidence: number) => {
    const sinIncidence = Math.sin(incidence);
    const reference = prismDeviationRad(nReference, incidence, apexRad, sinIncidence);
    return (n: number) => reference - prismDeviationRad(n, incidence, apexRad, sinIncidence);
  };
  /** The weighted straight line of x in u = tan(…) at one incidence: the profile of χ² over the incidence. */
  const profile = (incidence: number) => {
    const u: number[] = [];
    const angleOf = anglesAt(incidence);
    for (let i = 0; i < x.length; i++) {
      const value = Math.tan(angleOf(nOfPair[i]));
      if (!Number.isFinite(value)) return { chiSquare: Infinity, a: 0, b: 0 };
      u.push(value);
    }
    const line = weightedLine(u, x, sigma);
    if (!Number.isFinite(line.chiSquare)) return { chiSquare: Infinity, a: 0, b: 0 };
    return { chiSquare: line.chiSquare, a: line.intercept, b: line.slope };
  };

  // The profile is smooth but not convex over the whole scan (rays graze the faces at its ends), so a
  // scan around minimum deviation brackets the minimum before Brent's search.
  const minimumDeviation = Math.asin(Math.min(nReference * Math.sin(apexRad / 2), 1));
  const stepRad = 0.5 * DEG;
  /** The best incidence on a 0.5° grid of offsets (degrees) from `centre`, and whether it lies inside. */
  const scan = (centre: number, fromDeg: number, toDeg: number) => {
    let best = { incidence: Number.NaN, chiSquare: Infinity, inside: false };
    for (let offsetDeg = fromDeg; offsetDeg <= toDeg; offsetDeg += 0.5) {
      const incidence = centre + offsetDeg * DEG;
      if (incidence <= 0 || incidence >= Math.PI / 2) continue;
      const { chiSquare } = profile(incidence);
      if (chiSquare < best.chiSquare) {
        best = { incidence, chiSquare, inside: offsetDeg > fromDeg && offsetDeg < toDeg };
      }
    }
    return best;
  };
  // Growth refits nearly the same pairs many times: the last incidence, lower than its neighbours half
  // a degree away, brackets the minimum at once; otherwise a few degrees around it are scanned.
  const start = options.startIncidenceRad;
  let found = start !== undefined && Number.isFinite(start) ? scan(start, -0.5, 0.5) : null;
  if (found && !found.inside) found = scan(start!, -3, 3);
  if (!found || !found.inside || !Number.isFinite(found.chiSquare))
    found = scan(minimumDeviation, -25, 35);
  const bestIncidence = found.incidence;
  const bestChiSquare = found.chiSquare;
  if (!Number.isFinite(bestChiSquare)) {
    throw new CalibrationError(
      "fit-failed",
      `${glass}: no prism geometry passes all the pairs' wavelengths`,
    );
  }
  const scannedIncidence = brentMinimum(
    (incidence) => profile(incidence).chiSquare,
    Math.max(bestIncidence - stepRad, 1e-3),
    Math.min(bestIncidence + stepRad, Math.PI / 2 - 1e-3),
    1e-10,
  );
  const scanned = profile(scannedIncidence);
  if (!Number.isFinite(scanned.chiSquare) || scanned.b === 0) {
    throw new CalibrationError("fit-failed", `${glass}: the prism fit did not converge`);
  }

  const h = 1e-7;
  /** At one incidence and camera axis angle, as functions of a glass index n: the angle δref − δ(n), and
   * the camera tangent's slope in the incidence (a central difference over ± h). */
  const tangentsAt = (incidence: number, axisAngle: number) => {
    const angleOf = anglesAt(incidence);
    const above = anglesAt(incidence + h);
    const below = anglesAt(incidence - h);
    return {
      angleOf,
      slopeOf: (n: number) =>
        (cameraTangent(above(n), axisAngle) - cameraTangent(below(n), axisAngle)) / (2 * h),
    };
  };
  /** x(n) and its gradient in the parameters [incidence, b, a, (φ)] at given parameters, as functions of
   * a glass index n. */
  const modelAt = (parameters: readonly number[]) => {
    const [incidence, b, a, axisAngle = 0] = parameters;
    const { angleOf, slopeOf } = tangentsAt(incidence, axisAngle);
    return {
      valueOf: (n: number) => a + b * cameraTangent(angleOf(n), axisAngle),
      gradientOf: (n: number) => {
        const angle = angleOf(n);
        const row = [b * slopeOf(n), cameraTangent(angle, axisAngle), 1];
        // d/dφ of tan(v + φ) − tan φ: the curvature the camera's tangent law adds away from its axis.
        if (fitAxisAngle)
          row.push(b * (1 / Math.cos(angle + axisAngle) ** 2 - 1 / Math.cos(axisAngle) ** 2));
        return row;
      },
    };
  };

  /**
   * The weighted straight line of x in the camera tangent at (incidence, φ), with what a Gauss–Newton
   * step over (incidence, φ) needs: the whitened residuals and the derivatives of the model in both
   * angles with the line's span projected out (variable projection, Kaufman's form). Eliminating the
   * two linear parameters leaves a two-parameter problem that converges in a few steps, where a
   * four-parameter search crawls along the valley the strongly correlated angles make.
   */
  const projected = (incidence: number, axisAngle: number) => {
    const count = x.length;
    const w = sigma.map((s) => 1 / s);
    const u = new Array<number>(count);
    const du = [new Array<number>(count), new Array<number>(count)];
    const { angleOf, slopeOf } = tangentsAt(incidence, axisAngle);
    for (let i = 0; i < count; i++) {
      const angle = angleOf(nOfPair[i]);
      u[i] = cameraTangent(angle, axisAngle);
      du[0][i] = slopeOf(nOfPair[i]);
      du[1][i] = 1 / Math.cos(angle + axisAngle) ** 2 - 1 / Math.cos(axisAngle) ** 2;
    }
    // The whitened line (columns w and w·u) and the angles' derivatives with its span projected out.
    const { determinant, project } = lineProjection(w, u);
    const line = project(x.map((value, i) => value * w[i]));
    const b = line.beta;
    const columns = du.map((d) => project(d.map((value, i) => b * value * w[i])).rest) as [
      number[],
      number[],
    ];
    const chi = line.rest.reduce((sum, r) => sum + r * r, 0);
    return {
      a: line.alpha,
      b,
      residual: line.rest,
      columns,
      chiSquare: determinant > 0 && Number.isFinite(chi) ? chi : Infinity,
    };
  };
  const polishAxisAngle = (startIncidence: number) => {
    let incidence = startIncidence;
    let axisAngle = 0;
    let current = projected(incidence, axisAngle);
    let normal = twoParameterNormal(current.columns, current.residual);
    let damping = 1e-6;
    for (
      let iteration = 0;
      iteration < 60 && Number.isFinite(current.chiSquare) && damping < 1e10;
      iteration++
    ) {
      const step = dampedStep(normal, damping);
      if (!step) {
        damping *= 10;
        continue;
      }
      const [step0, step1] = step;
      const nextIncidence = incidence + step0;
      const nextAxisAngle = axisAngle + step1;
      const inside =
        nextIncidence > 1e-3 &&
        nextIncidence < Math.PI / 2 - 1e-3 &&
        Math.abs(nextAxisAngle) < MAX_AXIS_ANGLE_RAD;
      const trial = inside ? projected(nextIncidence, nextAxisAngle) : undefined;
      if (trial && trial.chiSquare < current.chiSquare) {
        const converged = current.chiSquare - trial.chiSquare <= 1e-10 * current.chiSquare + 1e-14;
        incidence = nextIncidence;
        axisAngle = nextAxisAngle;
        current = trial;
        normal = twoParameterNormal(current.columns, current.residual);
        damping = Math.max(damping / 10, 1e-12);
        if (converged) break;
      } else {
        damping *= 10;
      }
    }
    return {
      parameters: [incidence, current.b, current.a, axisAngle],
      chiSquare: current.chiSquare,
    };
  };

  let parameters = [scannedIncidence, scanned.b, scanned.a];
  let chiSquare = scanned.chiSquare;
  if (fitAxisAngle) {
    const polished = polishAxisAngle(scannedIncidence);
    if (polished.chiSquare < chiSquare) ({ parameters, chiSquare } = polished);
  }
  const fitted = modelAt(parameters);
  // Worked out on the first prediction interval asked for (most fits are only ranked by χ²); null when
  // the pairs do not determine the parameters.
  let covariance: number[][] | null | undefined;
  const covarianceOnce = () => {
    if (covariance === undefined) {
      try {
        covariance = jacobianCovariance(
          nOfPair.map((n, i) => fitted.gradientOf(n).map((g) => g / sigma[i])),
        );
      } catch (error) {
        if (!(error instanceof CalibrationError)) throw error;
        covariance = null;
      }
    }
    return covariance;
  };
  const dof = x.length - parameterCount;
  const varianceFactor = dof > 0 ? Math.max(1, chiSquare / dof) : 1;
  const predictX = (wavelengthNm: number) => fitted.valueOf(indexOrNaN(glass, wavelengthNm));
  return {
    glass,
    parameters,
    chiSquare,
    dof,
    predictX,
    predictionSigmaX: (wavelengthNm, peakSigmaX = 1) => {
      const g = fitted.gradientOf(indexOrNaN(glass, wavelengthNm));
      if (!g.every(Number.isFinite)) return Number.NaN;
      const covariance = covarianceOnce();
      if (!covariance) return Number.NaN;
      let variance = 0;
      for (let j = 0; j < parameterCount; j++)
        for (let k = 0; k < parameterCount; k++) variance += g[j] * covariance[j][k] * g[k];
      return Math.sqrt(varianceFactor * (variance + peakSigmaX ** 2));
    },
    determined: () => covarianceOnce() !== null,
  };
}
