// A prism glass named by the user must be described over the wavelengths it has to serve; otherwise
// the calibration refuses it in words rather than evaluating the formula beyond its resonance.
import { CalibrationError } from "./calibration-error";
import { GLASS_CATALOGUE, type GlassName } from "./glass-catalogue";
import { glassesValidOver } from "./glasses-valid-over";

/** Throws CalibrationError("glass-out-of-range") when `glass` is unknown or not valid over `rangeNm`. */
export function assertGlassValidOver(glass: GlassName, rangeNm: readonly [number, number]): void {
  const entry = (
    GLASS_CATALOGUE as Record<string, (typeof GLASS_CATALOGUE)[GlassName] | undefined>
  )[glass];
  if (!entry) {
    throw new CalibrationError(
      "glass-out-of-range",
      `the prism glass "${String(glass)}" is not in the catalogue`,
      { glass },
    );
  }
  if (glassesValidOver(rangeNm, [glass]).length === 0) {
    const [low, high] = [Math.min(...rangeNm), Math.max(...rangeNm)];
    throw new CalibrationError(
      "glass-out-of-range",
      `the glass ${glass} is described only between ${entry.validRangeNm[0]} and ${entry.validRangeNm[1]} nm, but the ` +
        `lamp lines span ${low.toFixed(1)}–${high.toFixed(1)} nm; choose the instrument's actual glass or no glass ` +
        `(the glass-free Hartmann model is then fitted)`,
      { glass, validRangeNm: entry.validRangeNm, rangeNm: [low, high] },
    );
  }
}
