// Reads what a column header says about the x axis: its unit (pixel, nm, Å, µm, cm⁻¹) and, for wavelengths, air or vacuum.
import type { AxisUnit, WavelengthMedium } from "../types";

/** The unit a label names, as written in the file. Micrometres are read but scaled to nm. */
export type LabelUnit = AxisUnit | "micrometre";

export interface AxisLabelReading {
  /** The one unit the label names, when it names exactly one. */
  unit?: LabelUnit;
  /** Every unit the label names, when it names more than one (the caller must choose). */
  conflicting?: LabelUnit[];
  /** True when the label says "wavelength" (or λ) but no unit. */
  wavelengthWithoutUnit: boolean;
  /** "air" or "vacuum" when the label says so. */
  medium?: WavelengthMedium;
}

const WAVELENGTH_WORDS = new Set(["wavelength", "wavelengths", "lambda", "λ", "wl", "wave"]);
const NM_WORDS = new Set(["nm", "nanometer", "nanometers", "nanometre", "nanometres"]);
const ANGSTROM_WORDS = new Set([
  "å",
  "angstrom",
  "angstroms",
  "ångström",
  "ångströms",
  "angström",
  "aa",
]);
const MICROMETRE_WORDS = new Set([
  "µm",
  "μm",
  "um",
  "micron",
  "microns",
  "micrometer",
  "micrometers",
  "micrometre",
  "micrometres",
]);
const PIXEL_WORDS = new Set(["pixel", "pixels", "px", "pix", "channel", "channels"]);
const WAVENUMBER_WORDS = new Set(["wavenumber", "wavenumbers"]);

/** What the header text `label` says about the axis; an empty reading when it says nothing. */
export function readAxisLabel(label: string): AxisLabelReading {
  const normal = label
    .toLowerCase()
    .replace(/\u212b/g, "å") // the ångström sign and the letter Å are different code points
    .replace(/[\u2212\u2013]/g, "-")
    .replace(/⁻/g, "-")
    .replace(/¹/g, "1");
  const compact = normal.replace(/[\s^*{}]/g, "");
  const tokens = normal.split(/[^a-z0-9åöµμλ]+/).filter((token) => token.length > 0);
  const found = new Set<LabelUnit>();
  if (
    compact.includes("cm-1") ||
    compact.includes("1/cm") ||
    tokens.some((t) => WAVENUMBER_WORDS.has(t))
  ) {
    found.add("wavenumber");
  }
  const saysWavelength = tokens.some((t) => WAVELENGTH_WORDS.has(t));
  for (const token of tokens) {
    if (NM_WORDS.has(token)) found.add("nm");
    else if (ANGSTROM_WORDS.has(token) || (token === "a" && saysWavelength)) found.add("angstrom");
    else if (MICROMETRE_WORDS.has(token)) found.add("micrometre");
    else if (PIXEL_WORDS.has(token)) found.add("pixel");
  }
  let medium: WavelengthMedium | undefined;
  if (tokens.includes("air")) medium = "air";
  if (tokens.includes("vacuum") || tokens.includes("vac"))
    medium = medium === "air" ? undefined : "vacuum";
  const reading: AxisLabelReading = {
    wavelengthWithoutUnit: saysWavelength && found.size === 0,
    medium,
  };
  if (found.size === 1) reading.unit = [...found][0];
  else if (found.size > 1) reading.conflicting = [...found];
  return reading;
}
