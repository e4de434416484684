// The workbench's fit of the edited pairs: the model asked for, or the pairing's refitted, and the
// baseline fit whose clean pairs every model is compared on.
import { CalibrationError } from "../calibration/calibration-error";
import type { CalibrationModelChoice } from "../calibration/calibration-model-choice";
import { fitCalibration, type FitCalibrationResult } from "../calibration/fit-calibration";
import type { LampPair } from "../calibration/lamp-pairing-types";
import type { EditLampCalibrationOptions } from "./edit-lamp-calibration-types";

const modelName = (kind: string, degree?: number) =>
  kind === "polynomial" ? `degree-${degree} polynomial` : `${kind} model`;

/** The model a choice asks for, or null for "auto". */
function requestedFit(
  choice: CalibrationModelChoice,
): { kind: "polynomial" | "hartmann" | "prism"; degree?: number } | null {
  if (choice === "auto") return null;
  if (choice.startsWith("polynomial-"))
    return { kind: "polynomial", degree: Number(choice.slice("polynomial-".length)) };
  return { kind: choice as "hartmann" | "prism" };
}

/**
 * The edited `pairs` fitted with the model `requested` ("auto": the model of `pairingFit`, refitted when
 * `edited`): `chosen` is the fit shown, `baseline` the fit of the pairing's model whose kept pairs the
 * models are compared on. Throws CalibrationError "too-few-pairs-left" when the model asked for needs
 * more pairs than remain, or the fit's own.
 */
export function fitEditedPairs(
  pairs: LampPair[],
  pairingFit: FitCalibrationResult,
  requested: CalibrationModelChoice,
  edited: boolean,
  options: EditLampCalibrationOptions,
): { chosen: FitCalibrationResult; baseline: FitCalibrationResult } {
  const { domain, glass, apexDeg } = options;
  // The model the pairing chose, refitted to the edited pairs (a polynomial's degree as the pairs allow).
  const autoFit = (): FitCalibrationResult => {
    const kind = pairingFit.model.kind;
    const degree =
      pairingFit.model.kind === "polynomial"
        ? Math.min(pairingFit.model.degree, Math.max(1, pairs.length - 2))
        : undefined;
    return fitCalibration(pairs, {
      model: kind,
      degree,
      domain,
      glass: kind === "prism" ? glass : undefined,
      apexDeg,
    });
  };
  const wanted = requestedFit(requested);
  const physical = options.dispersion === "prism" && (glass !== undefined || apexDeg !== undefined);
  // The model asked for first: that it needs more pairs than remain is what the chemist must hear, even
  // when the automatic model cannot be refitted to what remains either (a cubic through five pairs at
  // one end of the array can turn over before the other).
  let requestedResult: FitCalibrationResult | undefined;
  if (wanted) {
    try {
      requestedResult = fitCalibration(pairs, {
        model: wanted.kind,
        degree: wanted.degree,
        domain,
        glass,
        apexDeg,
      });
    } catch (error) {
      if (error instanceof CalibrationError && error.code === "too-few-pairs") {
        throw new CalibrationError(
          "too-few-pairs-left",
          `The ${modelName(wanted.kind, wanted.degree)} needs more pairs than remain (${error.message}). Include pairs again or choose a simpler model.`,
          {
            remaining: pairs.length,
            field: "model",
            fieldMessage: "Needs more pairs than remain.",
          },
        );
      }
      throw error;
    }
  }
  let baseline: FitCalibrationResult;
  try {
    baseline = edited ? autoFit() : pairingFit;
  } catch (error) {
    // The comparison then starts from the requested fit's clean pairs.
    if (!requestedResult) throw error;
    baseline = requestedResult;
  }
  if (!wanted && physical && baseline.model.kind === "prism") {
    baseline = fitCalibration(pairs, { model: "prism", domain, glass, apexDeg });
  }
  return { chosen: requestedResult ?? baseline, baseline };
}
