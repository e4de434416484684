// A pair the chemist names by pixel and wavelength, resolved to a lamp peak and a lamp line.
import type { LampLine } from "../calibration/lamp-pairing-types";
import type { Peak } from "../types";
import type { HandPair } from "./edit-lamp-calibration-types";
import { HAND_LINE_MATCH_NM } from "./hand-line-match-nm";
import { invalidEdit } from "./invalid-edit";

/** The peak nearest a pixel, if it lies within its own width (at least 3 pixels) of it; −1 otherwise. */
function peakNear(peaks: readonly Peak[], pixel: number): number {
  if (!Number.isFinite(pixel)) return -1;
  let nearest = -1;
  peaks.forEach((p, k) => {
    if (nearest < 0 || Math.abs(p.x - pixel) < Math.abs(peaks[nearest].x - pixel)) nearest = k;
  });
  if (nearest < 0 || Math.abs(peaks[nearest].x - pixel) > Math.max(3, 2 * peaks[nearest].fwhm))
    return -1;
  return nearest;
}

/** The lamp line nearest a wavelength, if within HAND_LINE_MATCH_NM of it; −1 otherwise. */
function lineAt(lines: readonly LampLine[], wavelengthNm: number): number {
  if (!Number.isFinite(wavelengthNm)) return -1;
  let nearest = -1;
  lines.forEach((l, k) => {
    if (
      nearest < 0 ||
      Math.abs(l.wavelengthNm - wavelengthNm) < Math.abs(lines[nearest].wavelengthNm - wavelengthNm)
    )
      nearest = k;
  });
  return nearest >= 0 && Math.abs(lines[nearest].wavelengthNm - wavelengthNm) <= HAND_LINE_MATCH_NM
    ? nearest
    : -1;
}

/** A hand pair resolved to a peak and a line, or the 400 that says which part names nothing. */
export function resolveHandPair(
  peaks: readonly Peak[],
  lines: readonly LampLine[],
  given: HandPair,
  field: string,
): { peakIndex: number; lineIndex: number } {
  const peakIndex = peakNear(peaks, given.pixel);
  if (peakIndex < 0)
    throw invalidEdit(
      `No lamp peak was found near pixel ${given.pixel}.`,
      `${field}.pixel`,
      "No lamp peak near this pixel.",
    );
  const lineIndex = lineAt(lines, given.wavelengthNm);
  if (lineIndex < 0) {
    throw invalidEdit(
      `No lamp line of the chosen gases at ${given.wavelengthNm} nm (±${HAND_LINE_MATCH_NM} nm) in the nominal range.`,
      `${field}.wavelengthNm`,
      "No lamp line at this wavelength.",
    );
  }
  return { peakIndex, lineIndex };
}
