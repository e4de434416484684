// Refuses an x axis that no spectrum can have: non-finite values, wavelengths that are not positive or
// longer than a metre, wavenumbers that are not positive, negative pixels.
import type { AxisUnit } from "../types";
import { SpectrumParseError } from "./spectrum-parse-error";
import { isWavelengthUnit } from "../types";

export interface AssertPhysicalAxisOptions {
  /** 1-based file line of point i, for the error; null where unknown. @default () => null */
  lineOf?: (index: number) => number | null;
  /** 1-based column of x, for the error. @default null */
  column?: number | null;
}

/** Largest x accepted per unit: 1 m as a wavelength (common practice: radio, not optical, beyond that). */
const LARGEST: Record<AxisUnit, number> = {
  nm: 1e9,
  angstrom: 1e10,
  // 1e9 pixels is far past any detector array (common practice); it keeps indexes exact.
  pixel: 1e9,
  // A wavenumber has no useful upper bound here; its lower bound is what the 1 m limit means.
  wavenumber: Number.MAX_VALUE,
};
/** Smallest x accepted: a wavenumber of 0.01 cm⁻¹ is a 1 m wavelength. */
const SMALLEST: Record<AxisUnit, number> = { nm: 0, angstrom: 0, pixel: 0, wavenumber: 0.01 };
const DESCRIBED: Record<AxisUnit, string> = {
  nm: "a wavelength must be positive and at most 1 m (1e9 nm)",
  angstrom: "a wavelength must be positive and at most 1 m (1e10 Å)",
  pixel: "a pixel index must be from 0 to 1e9",
  wavenumber: "a wavenumber must be at least 0.01 cm⁻¹ (a wavelength of at most 1 m)",
};

/**
 * Throws "not-finite" or "out-of-range" at the first x of `x` (in `unit`, already scaled to it) that is
 * not a physical value. Wavelengths must be above 0, pixels may be 0, wavenumbers at least 0.01 cm⁻¹.
 */
export function assertPhysicalAxis(
  x: ArrayLike<number>,
  unit: AxisUnit,
  options: AssertPhysicalAxisOptions = {},
): void {
  const { lineOf = () => null, column = null } = options;
  if (!(unit in LARGEST)) throw new RangeError(`unknown unit ${JSON.stringify(unit)}`);
  const largest = LARGEST[unit];
  const smallest = SMALLEST[unit];
  const wavelength = isWavelengthUnit(unit);
  for (let i = 0; i < x.length; i++) {
    const value = x[i];
    if (!Number.isFinite(value)) {
      throw new SpectrumParseError(
        "not-finite",
        `point ${i + 1} has x = ${value}`,
        lineOf(i),
        column,
      );
    }
    const tooSmall = wavelength ? !(value > smallest) : !(value >= smallest);
    if (tooSmall || value > largest) {
      throw new SpectrumParseError(
        "out-of-range",
        `point ${i + 1} has x = ${value}: ${DESCRIBED[unit]}`,
        lineOf(i),
        column,
      );
    }
  }
}
