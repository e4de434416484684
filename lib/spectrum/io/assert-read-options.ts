// Entry checks for the readers' options: a caller's mistake is a RangeError, not a file error.
import { WAVELENGTH_MEDIA } from "../types";
import type { SpectrumReadOptions } from "./spectrum-read-options";

const AXIS_UNITS = new Set(["pixel", "nm", "angstrom", "wavenumber"]);
const MEDIA: ReadonlySet<string> = new Set(WAVELENGTH_MEDIA);

/** Throws a RangeError for an unknown unit or medium, or limits and counts that are not positive integers. */
export function assertReadOptions(options: SpectrumReadOptions): void {
  const { maxPoints, minPoints, maxBytes, pixelCount } = options;
  for (const name of ["xUnit", "fallbackXUnit"] as const) {
    const unit = options[name];
    if (unit !== undefined && !AXIS_UNITS.has(unit)) {
      throw new RangeError(
        `${name} must be "pixel", "nm", "angstrom" or "wavenumber", got ${JSON.stringify(unit)}`,
      );
    }
  }
  for (const name of ["medium", "fallbackMedium"] as const) {
    const medium = options[name];
    if (medium !== undefined && !MEDIA.has(medium)) {
      throw new RangeError(`${name} must be "air" or "vacuum", got ${JSON.stringify(medium)}`);
    }
  }
  for (const [name, value] of [
    ["maxPoints", maxPoints],
    ["minPoints", minPoints],
    ["maxBytes", maxBytes],
    ["pixelCount", pixelCount],
  ] as const) {
    if (value !== undefined && (!Number.isInteger(value) || value < 1)) {
      throw new RangeError(`${name} must be a positive integer, got ${String(value)}`);
    }
  }
  if (minPoints !== undefined && minPoints < 2)
    throw new RangeError(`minPoints must be at least 2, got ${minPoints}`);
}
