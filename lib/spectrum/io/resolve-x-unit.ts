// Settles the x unit and medium from what the file says and what the caller stated; refuses to guess.
import type { AxisUnit, WavelengthMedium } from "../types";
import { NM_PER_MICROMETRE } from "../units/physical-constants";
import type { LabelUnit } from "./read-axis-label";
import { SpectrumParseError } from "./spectrum-parse-error";
import { suggestXUnit } from "./suggest-x-unit";

export interface XUnitEvidence {
  /** The unit the file names, if exactly one. */
  fileUnit?: LabelUnit;
  /** Several units the file names at once. */
  conflicting?: LabelUnit[];
  /** The file says "wavelength" with no unit. */
  wavelengthWithoutUnit?: boolean;
  /** The medium the file names. */
  fileMedium?: WavelengthMedium;
  /** What the file's unit text literally was, for messages (e.g. `XUNITS=ARBITRARY UNITS`). */
  fileText?: string;
  /** Where the file says it (1-based), or null. */
  line?: number | null;
  column?: number | null;
  /** The unit the caller stated. */
  statedUnit?: AxisUnit;
  /** The medium the caller stated. */
  statedMedium?: WavelengthMedium;
  /** The x values, only to word a suggestion in the error. */
  x?: ArrayLike<number>;
}

export interface ResolvedXUnit {
  xUnit: AxisUnit;
  /** Factor taking the file's x to `xUnit` (1000 for µm → nm, else 1). */
  scale: number;
  medium?: WavelengthMedium;
  /** Where the unit came from. */
  source: "file" | "caller";
  /** The unit as written in the file, when it differs from xUnit (µm). */
  unitInFile?: string;
}

const UNIT_NAMES: Record<LabelUnit, string> = {
  pixel: "pixel",
  nm: "nm",
  angstrom: "Å",
  wavenumber: "cm⁻¹",
  micrometre: "µm",
};

/** The unit, scale and medium to use, or a SpectrumParseError ("unit-unknown" / "unit-conflict"). */
export function resolveXUnit(evidence: XUnitEvidence): ResolvedXUnit {
  const {
    fileUnit,
    conflicting,
    fileMedium,
    statedUnit,
    statedMedium,
    line = null,
    column = null,
  } = evidence;
  const said = evidence.fileText ? ` (${evidence.fileText})` : "";
  if (conflicting && conflicting.length > 1 && statedUnit === undefined) {
    const names = conflicting.map((unit) => UNIT_NAMES[unit]).join(" and ");
    throw new SpectrumParseError(
      "unit-unknown",
      `the header names both ${names}${said}; state the x unit with options.xUnit`,
      line,
      column,
    );
  }
  let xUnit: AxisUnit;
  let scale = 1;
  let unitInFile: string | undefined;
  let source: "file" | "caller";
  if (fileUnit !== undefined) {
    const fileAxis: AxisUnit = fileUnit === "micrometre" ? "nm" : fileUnit;
    if (statedUnit !== undefined && statedUnit !== fileUnit) {
      throw new SpectrumParseError(
        "unit-conflict",
        `the file gives x in ${UNIT_NAMES[fileUnit]}${said} but the caller stated ${UNIT_NAMES[statedUnit]}`,
        line,
        column,
      );
    }
    xUnit = fileAxis;
    source = "file";
    if (fileUnit === "micrometre") {
      scale = NM_PER_MICROMETRE;
      unitInFile = "micrometre";
    }
  } else if (statedUnit !== undefined) {
    if (evidence.wavelengthWithoutUnit && (statedUnit === "pixel" || statedUnit === "wavenumber")) {
      throw new SpectrumParseError(
        "unit-conflict",
        `the header says the x column is a wavelength${said} but the caller stated ${UNIT_NAMES[statedUnit]}`,
        line,
        column,
      );
    }
    xUnit = statedUnit;
    source = "caller";
  } else {
    const what = evidence.wavelengthWithoutUnit
      ? `the header says wavelength${said} but not whether in nm or Å`
      : `the file does not say what the x column is${said}`;
    const suggestion = evidence.x ? suggestXUnit(evidence.x) : null;
    const hint = suggestion
      ? ` (suggestXUnit suggests "${suggestion.unit}": ${suggestion.reason})`
      : "";
    throw new SpectrumParseError(
      "unit-unknown",
      `${what}; state it with options.xUnit ("pixel", "nm", "angstrom" or "wavenumber")${hint}`,
      line,
      column,
    );
  }
  let medium: WavelengthMedium | undefined;
  if (xUnit === "nm" || xUnit === "angstrom") {
    if (fileMedium !== undefined && statedMedium !== undefined && fileMedium !== statedMedium) {
      throw new SpectrumParseError(
        "unit-conflict",
        `the file gives ${fileMedium} wavelengths but the caller stated ${statedMedium}`,
        line,
        column,
      );
    }
    medium = fileMedium ?? statedMedium;
  }
  return { xUnit, scale, medium, source, unitInFile };
}
