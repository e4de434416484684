// Sorts a reference line table once into typed arrays so each analysis can binary-search it.

import type { ReferenceLine, WavelengthMedium } from "../types";
import { wavelengthForMatchingNm } from "./wavelength-for-matching-nm";

export interface PrepareLineIndexOptions {
  /** Axis the peaks are calibrated on; see wavelengthForMatchingNm.
   * @default "air" */
  medium?: WavelengthMedium;
}

/** A line table sorted for fast look-up; build it once per table release and reuse it. */
export interface LineIndex {
  /** The table as given (not copied, never changed); indices below point into it. */
  lines: readonly ReferenceLine[];
  medium: WavelengthMedium;
  /** Matching wavelengths in nm of the atomic lines (not band heads), ascending. */
  lineWavelengthNm: Float64Array;
  /** lines[lineOrder[i]] has wavelength lineWavelengthNm[i]. */
  lineOrder: Uint32Array;
  /** Largest tabulated uncertainty among the atomic lines, in nm; bounds the search window. */
  maxLineUncertaintyNm: number;
  /** Band-head wavelengths in nm, ascending. */
  bandHeadNm: Float64Array;
  /** lines[bandOrder[i]] is the band with head bandHeadNm[i]. */
  bandOrder: Uint32Array;
  /** Largest band extent in nm; bounds the band search window. */
  maxBandExtentNm: number;
  /** Largest tabulated uncertainty among the band heads, in nm. */
  maxBandUncertaintyNm: number;
}

/**
 * Splits the table into atomic lines and band heads and sorts each by matching wavelength
 * (ties broken by table position, so the order is deterministic).
 */
export function prepareLineIndex(
  lines: readonly ReferenceLine[],
  options: PrepareLineIndexOptions = {},
): LineIndex {
  const { medium = "air" } = options;
  if (medium !== "air" && medium !== "vacuum") {
    throw new RangeError(`medium must be "air" or "vacuum", got ${String(medium)}`);
  }
  const atomic: number[] = [];
  const bands: number[] = [];
  const wavelengthNm = new Float64Array(lines.length);
  let maxLineUncertaintyNm = 0;
  let maxBandExtentNm = 0;
  let maxBandUncertaintyNm = 0;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const nm = wavelengthForMatchingNm(line, medium);
    if (!(nm > 0) || !Number.isFinite(nm)) {
      throw new RangeError(`line ${line.id} (${line.species}) has no usable wavelength: ${nm}`);
    }
    if (!(line.uncertaintyNm >= 0) || !Number.isFinite(line.uncertaintyNm)) {
      throw new RangeError(`line ${line.id} has an invalid uncertaintyNm: ${line.uncertaintyNm}`);
    }
    wavelengthNm[i] = nm;
    if (line.flags.bandHead && line.band) {
      if (!(line.band.extentNm > 0)) {
        throw new RangeError(
          `band ${line.id} needs a positive extentNm, got ${line.band.extentNm}`,
        );
      }
      bands.push(i);
      maxBandExtentNm = Math.max(maxBandExtentNm, line.band.extentNm);
      maxBandUncertaintyNm = Math.max(maxBandUncertaintyNm, line.uncertaintyNm);
    } else {
      atomic.push(i);
      maxLineUncertaintyNm = Math.max(maxLineUncertaintyNm, line.uncertaintyNm);
    }
  }
  const byWavelength = (a: number, b: number) => wavelengthNm[a] - wavelengthNm[b] || a - b;
  atomic.sort(byWavelength);
  bands.sort(byWavelength);
  return {
    lines,
    medium,
    lineWavelengthNm: Float64Array.from(atomic, (i) => wavelengthNm[i]),
    lineOrder: Uint32Array.from(atomic),
    maxLineUncertaintyNm,
    bandHeadNm: Float64Array.from(bands, (i) => wavelengthNm[i]),
    bandOrder: Uint32Array.from(bands),
    maxBandExtentNm,
    maxBandUncertaintyNm,
  };
}
