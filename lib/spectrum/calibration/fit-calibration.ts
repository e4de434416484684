// Fits a wavelength calibration to lamp pairs with iterative outlier rejection: the calibration step
// a chemist runs once per instrument and date.
import { median } from "../statistics/median";
import { jStat } from "jstat";
import type { CalibrationPair } from "../types";
import { assertDomain, assertPairs } from "./assertions";
import { assertMonotonicCalibration } from "./assert-monotonic-calibration";
import { CalibrationError } from "./calibration-error";
import type {
  CalibrationModel,
  CalibrationModelKind,
  CalibrationWarning,
  FittedCalibrationPair,
  PrismCalibrationModel,
} from "./calibration-model";
import { fitHartmannModel } from "./fit-hartmann-model";
import { fitPolynomialModel } from "./fit-polynomial-model";
import type { GlassTermsStart } from "./fit-glass-terms";
import { fitPrismModel, type PrismFitSettings } from "./fit-prism-model";
import { FITTED_GLASS_PARAMETERS, fittedGlassStart, fittedGlassTermsOf } from "./fitted-glass";
import { assertGlassValidOver } from "./assert-glass-valid-over";
import { GLASS_NAMES, type GlassName } from "./glass-catalogue";
import { glassesValidOver } from "./glasses-valid-over";
import { informationCriteria } from "./information-criteria";
import { modelEvaluation, prismGeometryOf } from "./model-evaluation";
import type { CovarianceScaling, ModelFitInput } from "./model-fit-input";

export interface FitCalibrationOptions {
  /**
   * Which dispersion relation to fit.
   * @default "polynomial"
   */
  model?: CalibrationModelKind;
  /**
   * Polynomial degree, 1–5 (polynomial model only).
   * @default 3
   */
  degree?: number;
  /**
   * The array's extent on the input axis [xMin, xMax]; the solution must be monotonic over all of it.
   * @default the extent of the pairs
   */
  domain?: [number, number];
  /**
   * Glass of the prism (prism model). When omitted every catalogue glass is tried and the one with the
   * lowest AICc is kept; all catalogue glasses have the same parameter count, so AICc and BIC rank them
   * alike (by χ²) and the choice of criterion only matters across models (and against a fitted glass,
   * see `fitGlass`).
   * @default undefined (try the catalogue)
   */
  glass?: GlassName;
  /**
   * Apex angle of the prism in degrees (prism model).
   * @default 60
   */
  apexDeg?: number;
  /**
   * Fit the apex angle too (it is strongly correlated with the incidence angle; expect a wide covariance).
   * @default false
   */
  fitApex?: boolean;
  /**
   * Fit the camera axis angle (prism model): where the camera looks relative to the ray of the pairs'
   * middle wavelength. Without it the camera is assumed centred on that ray, which a real instrument
   * is not; over 350–900 nm that alone bends the calibration by several tenths of a nm at the ends.
   * @default true
   */
  fitAxisAngle?: boolean;
  /**
   * Fit the glass's Sellmeier terms with the geometry (prism model; fitted-glass.ts), for a glass the
   * catalogue does not hold: true fits them, starting from `glass` or else the best catalogue glass;
   * false keeps the catalogue's. Left out, they compete with the catalogue glasses by AICc (three
   * parameters more) when `glass` is omitted, the pairs leave them degrees of freedom and the best
   * catalogue glass misses the pairs by more than their σ allow.
   * @default undefined (compete when the glass is not given)
   */
  fitGlass?: boolean;
  /**
   * A stored prism model whose fitted glass a refit with `fitGlass` starts from (its angles and terms),
   * so that refitting it to other pairs searches near it rather than from a catalogue glass's likeness.
   * @default undefined
   */
  fittedGlassFrom?: PrismCalibrationModel;
  /**
   * Reject outliers one at a time while the worst residual, in units of the pair's σ (σx·|dλ/dx|),
   * exceeds clipSigma robust standard deviations.
   * @default true
   */
  rejectOutliers?: boolean;
  /**
   * Clipping threshold in robust standard deviations (1.4826 × median absolute normalised residual).
   * @default 4
   */
  clipSigma?: number;
  /**
   * At most this many pairs are rejected.
   * @default floor(0.25 × number of pairs)
   */
  maxRejections?: number;
  /**
   * Floor of the robust residual scale in nm, so exact synthetic data or a lucky fit does not reject
   * good pairs; lamp tables themselves differ by 0.001–0.002 nm between conventions (common practice).
   * @default 0.002
   */
  minResidualScaleNm?: number;
  /**
   * "residual": scale the covariance by χ²/dof (the spread of the residuals sets the error scale);
   * "absolute": trust the given x uncertainties as they are.
   * @default "residual"
   */
  covarianceScaling?: CovarianceScaling;
  /**
   * "x-uncertainty": weight each pair by 1/(σx·dλ/dx)² (σx = 1 when not given);
   * "uniform": ordinary unweighted least squares in nm.
   * @default "x-uncertainty"
   */
  weighting?: "x-uncertainty" | "uniform";
}

export interface FitCalibrationResult {
  model: CalibrationModel;
  /** Every input pair, in input order, with its residual under the final model and whether it was used. */
  pairs: FittedCalibrationPair[];
  /** The pairs the outlier rejection removed, worst first. */
  rejected: FittedCalibrationPair[];
  rmsNm: number;
  dof: number;
  warnings: CalibrationWarning[];
}

/** Parameters each model fits, so the too-few-pairs error can say what is needed. */
export function parameterCount(
  kind: CalibrationModelKind,
  degree = 3,
  fitApex = false,
  fitAxisAngle = true,
  fitGlass = false,
): number {
  if (kind === "polynomial") return degree + 1;
  if (kind === "hartmann") return 4;
  return (
    3 + (fitApex ? 1 : 0) + (fitAxisAngle ? 1 : 0) + (fitGlass ? FITTED_GLASS_PARAMETERS.length : 0)
  );
}

/** Pairs beyond a fitted glass's parameters before it competes with the catalogue: AICc needs n > k + 1. */
const FITTED_GLASS_SPARE_PAIRS = 3;
/**
 * A fitted glass competes only when the best catalogue glass misses the pairs by more than their σ
 * allow (χ² beyond this quantile for its degrees of freedom, on the pairs' own σ; the pairing's
 * lack-of-fit check uses the same quantile on σ floored at 3 % of a line width):
 * its three terms more can also bend onto pulled end pairs that a catalogue glass would not follow. On
 * fresh prisms (seed 17200000, 300) without this gate an SF10 prism's fitted glass followed two red
 * pairs 0.4 and 0.6 nm off and was "paired" 1.4 times the accuracy wrong.
 */
const FITTED_GLASS_WHEN_CHI2_BEYOND = 0.999;

/** The settings fitOnce reads: every option but the domain, with the prism's glass options optional. */
type FitOnceOptions = Required<
  Omit<FitCalibrationOptions, "glass" | "domain" | "fitGlass" | "fittedGlassFrom">
> &
  Pick<FitCalibrationOptions, "glass" | "fitGlass" | "fittedGlassFrom">;

/** Fits one model kind to the given subset. */
function fitOnce(input: ModelFitInput, options: FitOnceOptions): CalibrationModel {
  const uniform = options.weighting === "uniform";
  if (options.model === "polynomial")
    return fitPolynomialModel(input, options.degree, options.covarianceScaling, uniform);
  if (options.model === "hartmann")
    return fitHartmannModel(input, options.covarianceScaling, uniform);
  return fitPrism(input, options);
}

/**
 * The prism model: the named glass, or the catalogue's best by AICc, against which a glass with its
 * terms fitted competes (fitted-glass.ts) when none is named; with `fitGlass`, the fitted glass alone.
 */
function fitPrism(input: ModelFitInput, options: FitOnceOptions): PrismCalibrationModel {
  const settings = {
    apexDeg: options.apexDeg,
    fitApex: options.fitApex,
    fitAxisAngle: options.fitAxisAngle,
    scaling: options.covarianceScaling,
  };
  // A stored model's fitted glass is refitted from its own angles and terms.
  const from = options.fittedGlassFrom;
  if (options.fitGlass === true && from?.glassFitted) {
    return fitPrismModel(input, {
      ...settings,
      glass: from.glass,
      fitGlass: true,
      start: fittedGlassStartOf(from, fittedGlassTermsOf(from.parameters)),
    });
  }
  // A glass is tried only where its formula holds; a named one that does not is refused in words.
  const pairRange: [number, number] = [
    Math.min(...input.wavelengthNm),
    Math.max(...input.wavelengthNm),
  ];
  if (options.glass) assertGlassValidOver(options.glass, pairRange);
  const glasses = options.glass ? [options.glass] : glassesValidOver(pairRange, GLASS_NAMES);
  if (glasses.length === 0) {
    throw new CalibrationError(
      "fit-failed",
      `no catalogue glass is described over ${pairRange[0].toFixed(1)}–${pairRange[1].toFixed(1)} nm; the glass-free Hartmann model can be fitted instead`,
    );
  }
  const scored: { model: PrismCalibrationModel; aicc: number }[] = [];
  let lastError: unknown;
  for (const glass of glasses) {
    try {
      const model = fitPrismModel(input, { ...settings, glass });
      const { aicc } = informationCriteria(
        model.chiSquare,
        model.pairCount,
        model.parameters.length,
      );
      scored.push({ model, aicc });
    } catch (error) {
      lastError = error;
    }
  }
  scored.sort((a, b) => a.aicc - b.aicc);
  const starts = scored.slice(0, FITTED_GLASS_STARTS).map((s) => s.model);
  if (options.fitGlass === true) {
    const fitted = fittedGlassPrism(input, pairRange, starts, settings);
    if (!fitted.model) {
      throw (
        fitted.error ??
        lastError ??
        new CalibrationError("fit-failed", "no catalogue glass fits the pairs")
      );
    }
    return fitted.model;
  }
  const best = scored[0];
  if (!best)
    throw lastError ?? new CalibrationError("fit-failed", "no catalogue glass fits the pairs");
  if (
    options.fitGlass === undefined &&
    !options.glass &&
    !options.fitApex &&
    input.x.length >=
      best.model.parameters.length + FITTED_GLASS_PARAMETERS.length + FITTED_GLASS_SPARE_PAIRS &&
    best.model.chiSquare > jStat.chisquare.inv(FITTED_GLASS_WHEN_CHI2_BEYOND, best.model.dof)
  ) {
    const { model } = fittedGlassPrism(input, pairRange, starts, settings);
    if (
      model &&
      informationCriteria(model.chiSquare, model.pairCount, model.parameters.length).aicc <
        best.aicc
    )
      return model;
  }
  return best.model;
}

/** Catalogue glasses (the best-fitting first) a fitted glass starts from; the best fit is kept. */
const FITTED_GLASS_STARTS = 3;

/**
 * The prism with its glass's terms fitted, from each catalogue fit of `starts` (its angles, and terms
 * in its glass's likeness over the pairs' range `rangeNm`; a start whose geometry sits at a bound of
 * the catalogue fit can stall short of the fit another start reaches): the lowest χ², or none and the
 * last start's error.
 */
function fittedGlassPrism(
  input: ModelFitInput,
  rangeNm: readonly [number, number],
  starts: readonly PrismCalibrationModel[],
  settings: Omit<PrismFitSettings, "glass" | "fitGlass" | "start">,
): { model: PrismCalibrationModel | null; error?: CalibrationError } {
  let model: PrismCalibrationModel | null = null;
  let error: CalibrationError | undefined;
  for (const catalogue of starts) {
    try {
      const fitted = fitPrismModel(input, {
        ...settings,
        glass: catalogue.glass,
        fitGlass: true,
        start: fittedGlassStartOf(catalogue, fittedGlassStart(catalogue.glass, rangeNm)),
      });
      if (!model || fitted.chiSquare < model.chiSquare) model = fitted;
    } catch (caught) {
      // A start that does not converge leaves the others.
      if (!(caught instanceof CalibrationError)) throw caught;
      error = caught;
    }
  }
  return { model, error };
}

/** A fitted glass's start: `model`'s incidence and camera axis angle, and the glass terms `terms`. */
function fittedGlassStartOf(
  model: PrismCalibrationModel,
  terms: readonly number[],
): GlassTermsStart {
  const geometry = prismGeometryOf(model);
  return { incidenceRad: geometry.incidenceRad, axisAngleRad: geometry.axisAngleRad ?? 0, terms };
}

/** Each pair's σx as the fit weighs it: pairs without one take the median of the given ones (1 when none is). */
export function fittedXUncertainties(pairs: readonly CalibrationPair[]): number[] {
  const given = pairs.flatMap((p) => (p.xUncertainty === undefined ? [] : [p.xUncertainty]));
  const fallback = given.length > 0 ? median(given) : 1;
  return pairs.map((p) => p.xUncertainty ?? fallback);
}

/** Fits `pairs` with the chosen model, rejecting outliers one at a time. */
export function fitCalibration(
  pairs: CalibrationPair[],
  options: FitCalibrationOptions = {},
): FitCalibrationResult {
  assertPairs(pairs);
  const {
    model: kind = "polynomial",
    degree = 3,
    apexDeg = 60,
    fitApex = false,
    fitAxisAngle = true,
    rejectOutliers = true,
    clipSigma = 4,
    maxRejections = Math.floor(0.25 * pairs.length),
    minResidualScaleNm = 0.002,
    covarianceScaling = "residual",
    weighting = "x-uncertainty",
    glass,
    fitGlass,
  } = options;
  if (kind === "polynomial" && !(Number.isInteger(degree) && degree >= 1 && degree <= 5)) {
    throw new RangeError(`degree must be an integer from 1 to 5, got ${degree}`);
  }
  if (!(clipSigma > 0)) throw new RangeError(`clipSigma must be positive, got ${clipSigma}`);
  if (!(apexDeg > 0 && apexDeg < 90))
    throw new RangeError(`apexDeg must be in (0, 90), got ${apexDeg}`);
  if (fitApex && fitGlass === true)
    throw new RangeError(
      "the apex angle and the glass's terms cannot both be fitted: they trade off",
    );
  const needed = parameterCount(kind, degree, fitApex, fitAxisAngle, fitGlass === true) + 1;
  if (pairs.length < needed) {
    throw new CalibrationError(
      "too-few-pairs",
      `a ${kind === "polynomial" ? `degree-${degree} polynomial` : `${kind} model`} needs at least ${needed} pairs ` +
        `(parameters + 1), got ${pairs.length}`,
      { needed, given: pairs.length },
    );
  }
  const xs = pairs.map((p) => p.x);
  const domain = options.domain ?? [Math.min(...xs), Math.max(...xs)];
  assertDomain(domain);
  const sigmaX = fittedXUncertainties(pairs);
  const settings: FitOnceOptions = {
    model: kind,
    degree,
    apexDeg,
    fitApex,
    fitAxisAngle,
    rejectOutliers,
    clipSigma,
    maxRejections,
    minResidualScaleNm,
    covarianceScaling,
    weighting,
    glass,
    fitGlass,
    fittedGlassFrom: options.fittedGlassFrom,
  };

  const used = pairs.map(() => true);
  const rejectedOrder: number[] = [];
  const fitUsed = () => {
    const indices = used.flatMap((u, i) => (u ? [i] : []));
    const input: ModelFitInput = {
      x: indices.map((i) => pairs[i].x),
      wavelengthNm: indices.map((i) => pairs[i].wavelengthNm),
      xUncertainty: indices.map((i) => sigmaX[i]),
      domain: [domain[0], domain[1]],
    };
    return fitOnce(input, settings);
  };
  let model = fitUsed();
  // The first fit settles whether the glass is fitted: outliers are then judged, and refits made, in
  // one family (the fitted glass refitted from its own terms).
  if (model.kind === "prism" && settings.fitGlass === undefined) {
    settings.fitGlass = model.glassFitted ?? false;
    if (model.glassFitted) settings.fittedGlassFrom = model;
  }
  const residualsOf = (m: CalibrationModel) => {
    const fitted = modelEvaluation(m, xs).wavelengthNm;
    return pairs.map((p, i) => p.wavelengthNm - fitted[i]);
  };
  let residuals = residualsOf(model);
  // Outliers are judged in units of each pair's σ in x (residual / (σx·|dλ/dx|)): under a prism's
  // strongly varying dispersion 1 nm is a small error in the red and a gross one in the blue.
  const sigmaNmOf = (m: CalibrationModel) => {
    const dispersion = modelEvaluation(m, xs).dispersion;
    return pairs.map((_, i) => sigmaX[i] * Math.max(Math.abs(dispersion[i]), 1e-12));
  };
  while (
    rejectOutliers &&
    rejectedOrder.length < maxRejections &&
    used.filter(Boolean).length > needed
  ) {
    const sigmaNm = sigmaNmOf(model);
    const z = residuals.map((r, i) => r / sigmaNm[i]);
    const usedIndices = used.flatMap((u, i) => (u ? [i] : []));
    const floor = median(usedIndices.map((i) => minResidualScaleNm / sigmaNm[i]));
    const scale = Math.max(1.4826 * median(usedIndices.map((i) => Math.abs(z[i]))), floor);
    let worst = -1;
    for (const i of usedIndices) if (worst < 0 || Math.abs(z[i]) > Math.abs(z[worst])) worst = i;
    if (Math.abs(z[worst]) <= clipSigma * scale) break;
    used[worst] = false;
    rejectedOrder.push(worst);
    model = fitUsed();
    residuals = residualsOf(model);
  }
  assertMonotonicCalibration(model);

  const fittedPairs: FittedCalibrationPair[] = pairs.map((p, i) => ({
    ...p,
    residualNm: residuals[i],
    used: used[i],
  }));
  const warnings: CalibrationWarning[] = [];
  if (rejectedOrder.length > 0) {
    warnings.push({
      code: "outliers-rejected",
      message: `${rejectedOrder.length} of ${pairs.length} pairs were rejected as outliers (|residual| > ${clipSigma} robust σ)`,
    });
  }
  if (model.dof < 3) {
    warnings.push({
      code: "few-degrees-of-freedom",
      message: `only ${model.dof} degrees of freedom: the residuals say little about the calibration's quality`,
    });
  }
  return {
    model,
    pairs: fittedPairs,
    rejected: rejectedOrder.map((i) => fittedPairs[i]),
    rmsNm: model.rmsNm,
    dof: model.dof,
    warnings,
  };
}
