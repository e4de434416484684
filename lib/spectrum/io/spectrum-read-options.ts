// Options every spectrum reader shares: the stated unit and medium, and the size limits that keep a bad upload harmless.
import type { AxisUnit, WavelengthMedium } from "../types";

/** Default largest input, in bytes of UTF-8 text (64 MiB). */
export const DEFAULT_MAX_BYTES = 64 * 1024 * 1024;
/** Default largest number of data points. */
export const DEFAULT_MAX_POINTS = 2_000_000;
/** Default smallest number of data points: fewer cannot hold a line and its surroundings. */
export const DEFAULT_MIN_POINTS = 16;

export interface SpectrumReadOptions {
  /**
   * Unit of the x column, stated by the caller. Needed when the file does not say; when it does and
   * this disagrees, reading fails with "unit-conflict" rather than picking one.
   * @default undefined (taken from the file)
   */
  xUnit?: AxisUnit;
  /**
   * Medium of a wavelength axis (nm or Å), stated by the caller; ignored for pixels and wavenumbers.
   * @default undefined (taken from the file; left unset when the file does not say)
   */
  medium?: WavelengthMedium;
  /**
   * Unit of the x column when neither the file nor `xUnit` says (an instrument's usual export). Unlike
   * `xUnit`, it never contradicts a file: a file that names its unit is read in that unit.
   * @default undefined (no fallback)
   */
  fallbackXUnit?: AxisUnit;
  /**
   * Medium of a wavelength axis read in `fallbackXUnit` when neither the file nor `medium` says.
   * @default undefined
   */
  fallbackMedium?: WavelengthMedium;
  /**
   * The detector's pixel count. When nothing else says what the x column is, consecutive integers
   * from 0 or from 1 (in either direction) exactly this many are read as pixel indices.
   * @default undefined (never inferred)
   */
  pixelCount?: number;
  /**
   * Largest accepted input, in bytes of UTF-8.
   * @default 67108864 (64 MiB)
   */
  maxBytes?: number;
  /**
   * Largest accepted number of data points.
   * @default 2000000
   */
  maxPoints?: number;
  /**
   * Smallest accepted number of data points.
   * @default 16
   */
  minPoints?: number;
}
