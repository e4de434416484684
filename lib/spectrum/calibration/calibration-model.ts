// Serialisable shapes of a wavelength calibration: a later service stores the model as plain JSON and
// evaluates it again with evaluateCalibration, so nothing here holds functions or typed arrays.
import type { CalibrationPair } from "../types";
import type { GlassName } from "./glass-catalogue";

/** Which dispersion relation a calibration uses. */
export type CalibrationModelKind = "polynomial" | "hartmann" | "prism";

/** Maps the input axis onto t = (x − centre) / halfRange, so t runs over [−1, 1] on the array domain. */
export interface XNormalisation {
  centre: number;
  halfRange: number;
}

/** Fields every calibration model carries. */
export interface CalibrationModelBase {
  /** Schema version of the stored JSON. */
  version: 1;
  /** The array's full extent on the input axis, [xMin, xMax] (pixels, or the factory axis in nm). */
  domain: [number, number];
  /** How x is normalised before the parameters apply (polynomial and Hartmann use t). */
  xNormalisation: XNormalisation;
  /**
   * The covered range on the input axis: the extent of the used pairs, or less where a trusted
   * automatic pairing claims less (claim-sound-ends.ts, then claim-from-second-pairs.ts: from its
   * second sound pair at each end), or where a recalibration's drift is known.
   */
  coveredX: [number, number];
  /** The same covered range in wavelength, nm. */
  coveredNm: [number, number];
  /** Fitted parameter values; their meaning is given per kind and by `parameterNames`. */
  parameters: number[];
  parameterNames: string[];
  /** Parameter covariance (row-major, parameters × parameters), in the units of `parameters`. */
  covariance: number[][];
  /** Root-mean-square residual of the used pairs, nm (unweighted). */
  rmsNm: number;
  /** Degrees of freedom: used pairs − fitted parameters. */
  dof: number;
  /** Number of pairs the final fit used. */
  pairCount: number;
  /** Weighted sum of squared residuals; weights are 1/σ², σ = xUncertainty·|dλ/dx| (or |dλ/dx| alone). */
  chiSquare: number;
}

/** λ(t) = Σ cₖ tᵏ, k = 0…degree; parameters are c₀…c_degree in nm. For gratings. */
export interface PolynomialCalibrationModel extends CalibrationModelBase {
  kind: "polynomial";
  degree: number;
}

/**
 * Hartmann dispersion formula in normalised x: λ = λ₀ + c / (poleSide·(t₀ − t))^α.
 * parameters = [λ₀ (nm), c (nm), t₀ (normalised x), α]. poleSide is +1 when the pole t₀ lies above the
 * domain (t₀ > 1) and −1 when below (t₀ < −1), so the base of the power stays positive on the array.
 */
export interface HartmannCalibrationModel extends CalibrationModelBase {
  kind: "hartmann";
  poleSide: 1 | -1;
}

/**
 * Physical prism: a ray of wavelength λ enters the prism at incidence θ₁, leaves deviated by δ(λ)
 * (Snell's law at both faces with the glass's Sellmeier n(λ)), and a camera of focal length f (in x
 * units per radian) whose axis is deviated by δ(λref) + φ images it at
 * x = axisX + direction·f·(tan(δ(λref) − δ(λ) + φ) − tan φ), so axisX is where the ray of
 * `referenceWavelengthNm` lands.
 * parameters = [θ₁ (rad), f (x units), axisX (x units)], then the apex angle (rad) when `apexFitted`,
 * then φ (rad) when `axisAngleFitted`; without φ the camera is centred on the reference ray (φ = 0);
 * then, when `glassFitted`, the glass's Sellmeier terms B₁, C₁ (µm²) and B₃ (fitted-glass.ts).
 */
export interface PrismCalibrationModel extends CalibrationModelBase {
  kind: "prism";
  glass: GlassName;
  /** Apex angle in degrees: as given, or the fitted value when `apexFitted`. */
  apexDeg: number;
  apexFitted: boolean;
  /**
   * True when the camera axis angle φ is the last parameter ("axisAngleRad"). A real instrument's
   * camera looks wherever it was mounted; pinning its axis to one wavelength's ray bends the
   * calibration by tenths of a nm at the ends of a wide range. Absent (models stored before it): φ = 0.
   */
  axisAngleFitted?: boolean;
  /**
   * True when the glass's index comes from Sellmeier terms fitted with the geometry (the last three
   * parameters) rather than from the catalogue: a glass the catalogue does not hold. `glass` then names
   * the catalogue glass the fit started from. Absent: the catalogue glass `glass`.
   */
  glassFitted?: boolean;
  /** +1 when wavelength grows with x, −1 when it falls. */
  direction: 1 | -1;
  /**
   * The wavelength whose ray lands on axisX (the middle of the pairs' range), nm. It only names the
   * origin of the angles when `axisAngleFitted`; otherwise the camera axis runs along its ray.
   */
  referenceWavelengthNm: number;
}

/** A stored wavelength calibration. */
export type CalibrationModel =
  PolynomialCalibrationModel | HartmannCalibrationModel | PrismCalibrationModel;

/** A note about a calibration's use that does not stop it. */
export interface CalibrationWarning {
  code: "outside-covered-range" | "outside-domain" | "outliers-rejected" | "few-degrees-of-freedom";
  message: string;
}

/** A pair after the fit: its residual and whether the final fit used it. */
export interface FittedCalibrationPair extends CalibrationPair {
  /** Known minus calibrated wavelength, nm. */
  residualNm: number;
  used: boolean;
}
