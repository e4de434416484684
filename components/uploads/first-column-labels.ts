// The words the pages use for what a file's first column holds, for an instrument's export profile and
// for a stored spectrum's x axis: one place, so the instrument page, its form and the upload page say
// the same thing.
import type { AxisUnit, FirstColumnKind, WavelengthMedium } from "@/lib/spectrum/types";
import type { FirstColumnFrom } from "@/lib/services/spectra";
import { isWavelengthUnit } from "@/lib/spectrum/types";

export const FIRST_COLUMN_LABELS: Record<FirstColumnKind, string> = {
  "pixel-from-0": "Pixel index, counted from 0",
  "pixel-from-1": "Pixel index, counted from 1",
  nm: "Wavelength in nm",
  angstrom: "Wavelength in Å",
  wavenumber: "Wavenumber in cm⁻¹",
};

export const MEDIUM_LABELS: Record<WavelengthMedium, string> = {
  air: "in air",
  vacuum: "in vacuum",
};

/** Why the first column was read as it was, after "read as …". */
export const FIRST_COLUMN_FROM_LABELS: Record<FirstColumnFrom, string> = {
  file: "as the file's header says",
  xUnit: "as you said",
  exportProfile: "through the instrument's export profile",
  pixelCount: "because its values are the detector's pixel indices, one per pixel",
};

/** "Wavelength in nm, in air"; the medium only for a wavelength column, and only when known. */
export function describeFirstColumn(
  unit: FirstColumnKind,
  medium: WavelengthMedium | null | undefined,
): string {
  const label = FIRST_COLUMN_LABELS[unit];
  return isWavelengthUnit(unit) && medium ? `${label}, ${MEDIUM_LABELS[medium]}` : label;
}

export const X_TITLES: Record<AxisUnit, string> = {
  pixel: "Pixel",
  nm: "Wavelength (nm)",
  angstrom: "Wavelength (Å)",
  wavenumber: "Wavenumber (cm⁻¹)",
};
