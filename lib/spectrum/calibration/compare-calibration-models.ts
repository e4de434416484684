// Fits every model the pairs support and compares them, so a chemist sees how each one fits and how
// it extrapolates before choosing; recommends a default per kind of dispersion.
import type { CalibrationPair, DispersionKind } from "../types";
import { CalibrationError } from "./calibration-error";
import type { CalibrationModel, CalibrationModelKind } from "./calibration-model";
import { calibrationUncertainty } from "./calibration-uncertainty";
import { fitCalibration, parameterCount, type FitCalibrationOptions } from "./fit-calibration";
import { informationCriteria } from "./information-criteria";
import { modelEvaluation } from "./model-evaluation";

export interface CompareCalibrationModelsOptions extends Omit<
  FitCalibrationOptions,
  "model" | "degree"
> {
  /** How the instrument disperses; decides the recommendation. */
  dispersion: DispersionKind;
  /**
   * Outlier rejection is off by default so that every candidate is fitted to the same pairs and the
   * information criteria compare like with like; clean the pairs with fitCalibration first.
   * @default false
   */
  rejectOutliers?: boolean;
}

/** λ and its 1σ at one end of the array. */
export interface CalibrationEnd {
  x: number;
  wavelengthNm: number;
  uncertaintyNm: number;
}

export interface CalibrationCandidate {
  kind: CalibrationModelKind;
  /** Polynomial degree, for polynomials. */
  degree?: number;
  /** Catalogue glass, for the prism model (with `glassFitted`, the one its fitted glass started from). */
  glass?: string;
  /** True when the prism model's glass terms were fitted from the pairs (fitted-glass.ts). */
  glassFitted?: boolean;
  parameterCount: number;
  /** Present when the fit succeeded. */
  model?: CalibrationModel;
  rmsNm?: number;
  dof?: number;
  aicc?: number;
  bic?: number;
  /** λ and uncertainty at xMin and at xMax: how the model extrapolates. */
  ends?: [CalibrationEnd, CalibrationEnd];
  /** Why the candidate failed (too few pairs, non-monotonic, …). */
  failure?: { code: string; message: string };
}

export interface CompareCalibrationModelsResult {
  candidates: CalibrationCandidate[];
  /** Index into candidates of the recommended default, or −1 when none fitted. */
  recommended: number;
  /** Why that one. */
  reason: string;
}

/** ΔAICc within which models count as equally supported (Burnham & Anderson 2002, rule of thumb). */
const EQUAL_SUPPORT = 2;

/** Fits polynomials of degree 1–5 (as the pairs allow), Hartmann and the prism model, and compares them. */
export function compareCalibrationModels(
  pairs: CalibrationPair[],
  options: CompareCalibrationModelsOptions,
): CompareCalibrationModelsResult {
  const { dispersion, rejectOutliers = false, ...fitOptions } = options;
  if (dispersion !== "grating" && dispersion !== "prism") {
    throw new RangeError(
      `options.dispersion must be "grating" or "prism", got ${String(dispersion)}`,
    );
  }
  const xs = pairs.map((p) => p.x);
  const domain = options.domain ?? [Math.min(...xs), Math.max(...xs)];
  const plans: { kind: CalibrationModelKind; degree?: number }[] = [1, 2, 3, 4, 5].map(
    (degree) => ({ kind: "polynomial", degree }),
  );
  plans.push({ kind: "hartmann" }, { kind: "prism" });
  const candidates: CalibrationCandidate[] = [];
  for (const plan of plans) {
    const k = parameterCount(
      plan.kind,
      plan.degree,
      options.fitApex ?? false,
      options.fitAxisAngle ?? true,
      options.fitGlass === true,
    );
    // Candidates the pairs cannot support (n < k + 1) are left out rather than listed as failures.
    if (pairs.length < k + 1) continue;
    const candidate: CalibrationCandidate = {
      kind: plan.kind,
      degree: plan.degree,
      parameterCount: k,
    };
    try {
      const fit = fitCalibration(pairs, {
        ...fitOptions,
        domain,
        rejectOutliers,
        model: plan.kind,
        degree: plan.degree,
      });
      // A prism fitted with its own glass terms has more parameters than the plan's catalogue glass.
      const fittedK = fit.model.parameters.length;
      const criteria = informationCriteria(fit.model.chiSquare, fit.model.pairCount, fittedK);
      const endX = new Float64Array(domain);
      const wavelengths = modelEvaluation(fit.model, endX).wavelengthNm;
      const uncertainties = calibrationUncertainty(fit.model, endX);
      Object.assign(candidate, {
        model: fit.model,
        parameterCount: fittedK,
        glass: fit.model.kind === "prism" ? fit.model.glass : undefined,
        glassFitted: fit.model.kind === "prism" && fit.model.glassFitted === true,
        rmsNm: fit.rmsNm,
        dof: fit.dof,
        aicc: criteria.aicc,
        bic: criteria.bic,
        ends: [0, 1].map((i) => ({
          x: endX[i],
          wavelengthNm: wavelengths[i],
          uncertaintyNm: uncertainties[i],
        })),
      });
    } catch (error) {
      if (!(error instanceof CalibrationError)) throw error;
      candidate.failure = { code: error.code, message: error.message };
    }
    candidates.push(candidate);
  }
  const fitted = (predicate: (c: CalibrationCandidate) => boolean) =>
    candidates
      .map((c, i) => ({ c, i }))
      .filter(({ c }) => c.model && Number.isFinite(c.aicc) && predicate(c));
  const pool = fitted((c) =>
    dispersion === "grating" ? c.kind === "polynomial" : c.kind !== "polynomial",
  );
  const usable = pool.length > 0 ? pool : fitted(() => true);
  if (usable.length === 0)
    return { candidates, recommended: -1, reason: "no candidate model could be fitted" };
  const bestAicc = Math.min(...usable.map(({ c }) => c.aicc!));
  // Among the equally supported, the fewest parameters: it extrapolates least wildly.
  const chosen = usable
    .filter(({ c }) => c.aicc! - bestAicc <= EQUAL_SUPPORT)
    .sort((a, b) => a.c.parameterCount - b.c.parameterCount || a.c.aicc! - b.c.aicc!)[0];
  const label =
    chosen.c.kind === "polynomial"
      ? `degree-${chosen.c.degree} polynomial`
      : `${chosen.c.kind} model`;
  return {
    candidates,
    recommended: chosen.i,
    reason:
      `${label}: fewest parameters within ΔAICc ≤ ${EQUAL_SUPPORT} of the best ` +
      (dispersion === "grating"
        ? "polynomial (grating)"
        : "prism-shaped model (prism: Hartmann or the physical prism)") +
      (pool.length === 0 ? "; no model of the preferred kind fitted, so all were considered" : ""),
  };
}
