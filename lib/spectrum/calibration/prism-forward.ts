// Forward model of a prism spectrometer, x(λ), and its numerical inverse λ(x) for the prism calibration.
//
// The forward direction is closed-form (Snell's law at both faces); the inverse has none, so λ(x) is
// found on a bracket by regula falsi (Illinois) safeguarded with bisection, which always converges
// because x(λ) is monotonic wherever the fit is accepted.
import { refractiveIndexOrNaN } from "./refractive-index-or-nan";
import { GLASS_CATALOGUE, type GlassName, type SellmeierGlass } from "./glass-catalogue";

/** Geometry of a prism spectrometer in the units the calibration fits it in. */
export interface PrismGeometry {
  glass: GlassName;
  /** The glass's index from these coefficients instead of the catalogue's (a glass fitted from the pairs). */
  sellmeier?: SellmeierGlass;
  /** Angle of incidence on the first face, rad. */
  incidenceRad: number;
  /** Apex (refracting) angle, rad. */
  apexRad: number;
  /** Focal length of the camera in x units per radian (positive). */
  focalX: number;
  /** x where the ray of the reference wavelength lands. */
  axisX: number;
  /** +1 when λ grows with x. */
  direction: 1 | -1;
  referenceWavelengthNm: number;
  /**
   * Deviation of the camera axis minus that of the reference wavelength's ray, rad: where the camera
   * looks is a property of the instrument, not of any wavelength, so a fit must be free to place it.
   * 0 or absent: the camera is centred on the reference ray.
   */
  axisAngleRad?: number;
}

/**
 * x relative to the reference ray's landing point, in units of the focal length, for a ray whose
 * deviation is `angleFromReferenceRad` (δref − δ) less than the reference ray's: tan(u + φ) − tan φ
 * with φ the camera axis angle. With φ = 0 it is tan u, a camera centred on the reference ray.
 */
export function cameraTangent(angleFromReferenceRad: number, axisAngleRad = 0): number {
  return axisAngleRad === 0
    ? Math.tan(angleFromReferenceRad)
    : Math.tan(angleFromReferenceRad + axisAngleRad) - Math.tan(axisAngleRad);
}

/**
 * Deviation angle (rad) of a ray through a prism of index n; NaN when the ray is totally reflected.
 * `sinIncidence` may be passed by a caller that asks about many indices at one incidence.
 */
export function prismDeviationRad(
  n: number,
  incidenceRad: number,
  apexRad: number,
  sinIncidence = Math.sin(incidenceRad),
): number {
  const insideFirst = Math.asin(sinIncidence / n);
  const sinExit = n * Math.sin(apexRad - insideFirst);
  if (!(Math.abs(sinExit) < 1)) return Number.NaN;
  return incidenceRad + Math.asin(sinExit) - apexRad;
}

/**
 * x(λ) of one geometry, with the glass's coefficients, the incidence's sine and the reference ray worked
 * out once: the inverse and the pairing's straightened axes ask it about thousands of wavelengths.
 */
export function prismForward(geometry: PrismGeometry): (wavelengthNm: number) => number {
  const coefficients = geometry.sellmeier ?? GLASS_CATALOGUE[geometry.glass];
  if (!coefficients) return () => Number.NaN;
  const nRef = refractiveIndexOrNaN(coefficients, geometry.referenceWavelengthNm);
  if (Number.isNaN(nRef)) return () => Number.NaN;
  const sinIncidence = Math.sin(geometry.incidenceRad);
  const deviationRef = prismDeviationRad(
    nRef,
    geometry.incidenceRad,
    geometry.apexRad,
    sinIncidence,
  );
  return (wavelengthNm) => {
    const n = refractiveIndexOrNaN(coefficients, wavelengthNm);
    if (Number.isNaN(n)) return Number.NaN;
    const deviation = prismDeviationRad(n, geometry.incidenceRad, geometry.apexRad, sinIncidence);
    // Red light is deviated less, so δref − δ grows with λ and `direction` says which way x runs.
    return (
      geometry.axisX +
      geometry.direction *
        geometry.focalX *
        cameraTangent(deviationRef - deviation, geometry.axisAngleRad)
    );
  };
}

/** x at which a wavelength lands; NaN where the ray cannot leave the prism or the glass has no index. */
export function prismForwardX(geometry: PrismGeometry, wavelengthNm: number): number {
  return prismForward(geometry)(wavelengthNm);
}

/** The wavelength span over which the inverse is searched, nm. */
const SEARCH_RANGE_NM: [number, number] = [200, 2500];
const GRID_POINTS = 400;

/**
 * λ(x) for each x by inverting prismForwardX; NaN for an x the forward model never reaches on the
 * search range (200–2500 nm, clipped to where the glass's formula and the ray exist).
 */
export function prismInverseWavelengths(
  geometry: PrismGeometry,
  x: ArrayLike<number>,
): Float64Array {
  // Tabulate x(λ) on a grid even in 1/λ (where prism dispersion is roughly uniform) to bracket each root.
  const forward = prismForward(geometry);
  const gridNm: number[] = [];
  const gridX: number[] = [];
  const [lo, hi] = SEARCH_RANGE_NM;
  for (let i = 0; i < GRID_POINTS; i++) {
    const inverse = 1 / lo + ((1 / hi - 1 / lo) * i) / (GRID_POINTS - 1);
    const wavelengthNm = 1 / inverse;
    const xAt = forward(wavelengthNm);
    if (Number.isFinite(xAt)) {
      gridNm.push(wavelengthNm);
      gridX.push(xAt);
    }
  }
  const result = new Float64Array(x.length).fill(Number.NaN);
  if (gridNm.length < 2) return result;
  // gridNm runs from blue to red; orient the search so x increases along the arrays.
  const sense = gridX[gridX.length - 1] > gridX[0] ? 1 : -1;
  const last = gridX.length - 1;
  for (let k = 0; k < x.length; k++) {
    const target = x[k];
    const goal = sense * target;
    if (!(goal >= sense * gridX[0] && goal <= sense * gridX[last])) continue;
    let low = 0;
    let high = last;
    while (high - low > 1) {
      const mid = (low + high) >> 1;
      if (sense * gridX[mid] <= goal) low = mid;
      else high = mid;
    }
    result[k] = rootOnBracket(
      forward,
      target,
      gridNm[low],
      gridX[low] - target,
      gridNm[high],
      gridX[high] - target,
    );
  }
  return result;
}

/**
 * The wavelength in [a, b] at which `forward` reaches `target`, given the misses fA and fB at the ends
 * (of opposite signs): regula falsi with the Illinois modification (an end kept twice has its miss
 * halved, so the bracket closes from both sides), one evaluation per step. From the grid's bracket a
 * few steps reach double precision, where Newton's steps with a numerical slope took three evaluations
 * each. A step outside the bracket bisects instead; NaN where the ray is lost inside the bracket.
 */
function rootOnBracket(
  forward: (wavelengthNm: number) => number,
  target: number,
  a: number,
  fA: number,
  b: number,
  fB: number,
): number {
  if (fA === 0) return a;
  if (fB === 0) return b;
  let kept = 0;
  let lambda = a - (fA * (b - a)) / (fB - fA);
  for (let iteration = 0; iteration < 100; iteration++) {
    const f = forward(lambda) - target;
    if (f === 0) return lambda;
    // A ray lost inside the grid's bracket (not seen for any catalogue glass): no answer here.
    if (!Number.isFinite(f)) return Number.NaN;
    if (Math.sign(f) === Math.sign(fA)) {
      a = lambda;
      fA = f;
      if (kept === -1) fB /= 2;
      kept = -1;
    } else {
      b = lambda;
      fB = f;
      if (kept === 1) fA /= 2;
      kept = 1;
    }
    const next = a - (fA * (b - a)) / (fB - fA);
    const inside = Number.isFinite(next) && next >= Math.min(a, b) && next <= Math.max(a, b);
    const settled = inside && Math.abs(next - lambda) < 1e-12 * lambda;
    lambda = inside ? next : (a + b) / 2;
    if (settled) break;
  }
  return lambda;
}
