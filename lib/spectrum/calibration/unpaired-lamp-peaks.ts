// Why a lamp peak was left unpaired, and which lamp lines the calibration puts on the array with no peak
// to show for them, so the workbench can say "blend" or "not in the table" instead of a bare list.
// Everything is judged in calibrated wavelength, within a multiple of the local FWHM.

import { upperMedian } from "../statistics/upper-median";

/** A lamp peak at its calibrated wavelength. */
export interface UnpairedLampPeakInput {
  /** Where the calibration puts the peak's centre, nm (NaN when the model gives none there). */
  wavelengthNm: number;
  /** The peak's FWHM turned into nm by the local dispersion. */
  fwhmNm: number;
  /** Whether the peak is in a pair (used, rejected or excluded). */
  paired: boolean;
}

/** A lamp line of the selected gases. */
export interface UnpairedLampLineInput {
  wavelengthNm: number;
  /** Whether a peak is paired with it. */
  paired: boolean;
}

/**
 * "broad": the peak is several times wider than the paired lines around it — continuum structure or a
 * clump of lines, not one lamp line (no line is named); "blend": the table line near the peak has another lamp line within reach, so no single line can be
 * named; "not-in-table": no lamp line of the selected gases is near; "line-paired-elsewhere": the one
 * line near is paired with another peak; "left-unpaired": one clean line is near but the pairing did not
 * take it (pair it by hand if it is right); "no-wavelength": the calibration gives the peak no wavelength.
 */
export type UnpairedPeakReasonCode =
  "broad" | "blend" | "not-in-table" | "line-paired-elsewhere" | "left-unpaired" | "no-wavelength";

export interface UnpairedPeakReason {
  code: UnpairedPeakReasonCode;
  /** Indices of the lamp lines the reason is about (those near the peak, and a blend's partners). */
  lineIndices: number[];
}

/** A line is "near" a peak within this many local FWHMs (the default of `widthFactor`). */
export const UNPAIRED_REACH_FWHM = 1.5;

export interface UnpairedLampPeaksOptions {
  /** The array's extent in calibrated wavelength, [min, max] nm: lines outside it cannot show. */
  arrayRangeNm: readonly [number, number];
  /**
   * "Near" means within this many local FWHMs.
   * @default 1.5
   */
  widthFactor?: number;
  /**
   * A peak wider than this many times the median FWHM of the (up to three) paired peaks nearest it is
   * "broad": no single lamp line makes it, and it stands for no line's place.
   * @default 3
   */
  broadFactor?: number;
}

/** Paired peaks a broad peak's width is compared with: the nearest ones, as the width changes along a prism. */
const WIDTH_NEIGHBOURS = 3;

export interface UnpairedLampPeaksResult {
  /** Per peak, in input order: why it is unpaired, or null when it is paired. */
  peakReasons: (UnpairedPeakReason | null)[];
  /** Indices of the unpaired lamp lines on the array with no peak within reach ("below threshold"). */
  expectedWithoutPeak: number[];
}

/** Reasons for the unpaired peaks and the expected lines with no peak. */
export function unpairedLampPeaks(
  peaks: readonly UnpairedLampPeakInput[],
  lines: readonly UnpairedLampLineInput[],
  options: UnpairedLampPeaksOptions,
): UnpairedLampPeaksResult {
  const { arrayRangeNm, widthFactor = UNPAIRED_REACH_FWHM, broadFactor = 3 } = options;
  if (!(Number.isFinite(broadFactor) && broadFactor > 1))
    throw new RangeError(`broadFactor must be finite and above 1, got ${broadFactor}`);
  if (!(Number.isFinite(widthFactor) && widthFactor > 0))
    throw new RangeError(`widthFactor must be positive and finite, got ${widthFactor}`);
  if (!(
    Number.isFinite(arrayRangeNm[0]) &&
    Number.isFinite(arrayRangeNm[1]) &&
    arrayRangeNm[0] < arrayRangeNm[1]
  )) {
    throw new RangeError(`arrayRangeNm must be [min, max] with finite min < max`);
  }
  peaks.forEach((p, i) => {
    if (!(Number.isFinite(p.fwhmNm) && p.fwhmNm > 0))
      throw new RangeError(`peaks[${i}].fwhmNm must be positive and finite, got ${p.fwhmNm}`);
  });
  lines.forEach((l, i) => {
    if (!(Number.isFinite(l.wavelengthNm) && l.wavelengthNm > 0)) {
      throw new RangeError(
        `lines[${i}].wavelengthNm must be positive and finite, got ${l.wavelengthNm}`,
      );
    }
  });

  const linesWithin = (wavelengthNm: number, reachNm: number, except = -1) =>
    lines.flatMap((l, j) =>
      j !== except && Math.abs(l.wavelengthNm - wavelengthNm) <= reachNm ? [j] : [],
    );

  // A line's width where a peak stands: the median of the nearest paired peaks' (NaN when none is paired).
  const paired = peaks.filter((p) => p.paired && Number.isFinite(p.wavelengthNm));
  const lineWidthNear = (wavelengthNm: number) => {
    const widths = paired
      .slice()
      .sort(
        (a, b) => Math.abs(a.wavelengthNm - wavelengthNm) - Math.abs(b.wavelengthNm - wavelengthNm),
      )
      .slice(0, WIDTH_NEIGHBOURS)
      .map((p) => p.fwhmNm);
    return upperMedian(widths);
  };
  const broad = peaks.map(
    (p) =>
      !p.paired &&
      Number.isFinite(p.wavelengthNm) &&
      p.fwhmNm > broadFactor * lineWidthNear(p.wavelengthNm),
  );

  const peakReasons = peaks.map((peak, i): UnpairedPeakReason | null => {
    if (peak.paired) return null;
    if (!Number.isFinite(peak.wavelengthNm)) return { code: "no-wavelength", lineIndices: [] };
    if (broad[i]) return { code: "broad", lineIndices: [] };
    const reachNm = widthFactor * peak.fwhmNm;
    const near = linesWithin(peak.wavelengthNm, reachNm);
    if (near.length === 0) return { code: "not-in-table", lineIndices: [] };
    // Another lamp line within reach of a table line near the peak: the peak may be both at once.
    const partners = near.flatMap((j) => linesWithin(lines[j].wavelengthNm, reachNm, j));
    if (partners.length > 0)
      return {
        code: "blend",
        lineIndices: [...new Set([...near, ...partners])].sort((a, b) => a - b),
      };
    const [only] = near;
    return {
      code: lines[only].paired ? "line-paired-elsewhere" : "left-unpaired",
      lineIndices: near,
    };
  });

  // A broad peak stands for no line: it neither hides an expected line nor sets the reach.
  const located = peaks.filter((p, i) => Number.isFinite(p.wavelengthNm) && !broad[i]);
  const expectedWithoutPeak = lines.flatMap((line, j) => {
    if (line.paired || line.wavelengthNm < arrayRangeNm[0] || line.wavelengthNm > arrayRangeNm[1])
      return [];
    if (located.length === 0) return [j];
    // The local width is that of the peak nearest the line: the resolution changes along the array.
    let nearest = located[0];
    for (const p of located)
      if (
        Math.abs(p.wavelengthNm - line.wavelengthNm) <
        Math.abs(nearest.wavelengthNm - line.wavelengthNm)
      )
        nearest = p;
    const reachNm = widthFactor * nearest.fwhmNm;
    return located.some((p) => Math.abs(p.wavelengthNm - line.wavelengthNm) <= reachNm) ? [] : [j];
  });

  return { peakReasons, expectedWithoutPeak };
}
