// Settles the x unit and medium from what the file says, what the caller stated and the caller's
// fallback (an instrument's usual export); refuses to guess. Its messages name no option: callers
// say in their own words how to state a unit.
import type { AxisUnit, WavelengthMedium } from "../types";
import { NM_PER_MICROMETRE } from "../units/physical-constants";
import { detectorPixelOrigin } from "./detector-pixel-origin";
import type { LabelUnit } from "./read-axis-label";
import { SpectrumParseError } from "./spectrum-parse-error";
import { suggestXUnit } from "./suggest-x-unit";
import { isWavelengthUnit } from "../types";

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
  /** The unit to use when neither the file nor the caller says. */
  fallbackUnit?: AxisUnit;
  /** The medium to use with the fallback unit when neither the file nor the caller says. */
  fallbackMedium?: WavelengthMedium;
  /** The detector's pixel count: a column of exactly its indices is pixels when nothing else says. */
  pixelCount?: number;
  /** The x values, for the pixel-count rule and to word a suggestion in the error. */
  x?: ArrayLike<number>;
}

export interface ResolvedXUnit {
  xUnit: AxisUnit;
  /** Factor taking the file's x to `xUnit` (1000 for µm → nm, else 1). */
  scale: number;
  medium?: WavelengthMedium;
  /** Where the unit came from: the file, the caller's statement, the caller's fallback, or the values
   * being exactly the detector's pixel indices. */
  source: "file" | "caller" | "fallback" | "pixel-count";
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

/**
 * The unit, scale and medium to use, or a SpectrumParseError ("unit-unknown" / "unit-conflict"). The
 * file's word comes first, then the caller's statement (which must agree with the file), then the
 * caller's fallback, then the pixel-count rule.
 */
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
      `the header names both ${names}${said}, so it does not say which the first column holds`,
      line,
      column,
    );
  }
  let xUnit: AxisUnit;
  let scale = 1;
  let unitInFile: string | undefined;
  let source: ResolvedXUnit["source"];
  if (fileUnit !== undefined) {
    const fileAxis: AxisUnit = fileUnit === "micrometre" ? "nm" : fileUnit;
    if (statedUnit !== undefined && statedUnit !== fileUnit) {
      throw new SpectrumParseError(
        "unit-conflict",
        `the file gives x in ${UNIT_NAMES[fileUnit]}${said} but ${UNIT_NAMES[statedUnit]} was stated for it`,
        line,
        column,
        "xUnit",
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
        `the header says the x column is a wavelength${said} but ${UNIT_NAMES[statedUnit]} was stated for it`,
        line,
        column,
        "xUnit",
      );
    }
    xUnit = statedUnit;
    source = "caller";
  } else if (
    evidence.fallbackUnit !== undefined &&
    !(evidence.wavelengthWithoutUnit && !isWavelengthUnit(evidence.fallbackUnit))
  ) {
    // A header that says "wavelength" but no unit leaves the unit to the fallback only when the
    // fallback is a wavelength unit; a pixel or wavenumber fallback would contradict it.
    xUnit = evidence.fallbackUnit;
    source = "fallback";
  } else if (
    evidence.pixelCount !== undefined &&
    evidence.x !== undefined &&
    !evidence.wavelengthWithoutUnit &&
    detectorPixelOrigin(evidence.x, evidence.pixelCount) !== null
  ) {
    xUnit = "pixel";
    source = "pixel-count";
  } else {
    const what = evidence.wavelengthWithoutUnit
      ? `the header says wavelength${said} but not whether in nm or Å`
      : `the file does not say what its first column holds${said}`;
    const suggestion = evidence.x ? suggestXUnit(evidence.x) : null;
    const hint = suggestion ? `; ${suggestion.reason}, as pixel indices would be` : "";
    throw new SpectrumParseError("unit-unknown", `${what}${hint}`, line, column);
  }
  let medium: WavelengthMedium | undefined;
  if (isWavelengthUnit(xUnit)) {
    if (fileMedium !== undefined && statedMedium !== undefined && fileMedium !== statedMedium) {
      throw new SpectrumParseError(
        "unit-conflict",
        `the file gives ${fileMedium} wavelengths but ${statedMedium} was stated for them`,
        line,
        column,
        "medium",
      );
    }
    medium =
      fileMedium ??
      statedMedium ??
      (xUnit === evidence.fallbackUnit ? evidence.fallbackMedium : undefined);
  }
  return { xUnit, scale, medium, source, unitInFile };
}
