// The workbench's lamp lines: the table's, with each blend the pairing paired at its centroid as a line.
import type { LampLine } from "../calibration/lamp-pairing-types";

/**
 * `lines` with a line of its own (id `blend:<member id>`) at the centroid of each blend that one of
 * `pairs` paired there, in wavelength order. A blend the pairing paired at its centroid (the Hg 365 nm
 * group) is a line of its own here, at that centroid, so that the workbench refits and shows the pair
 * the pairing made.
 */
export function linesWithPairedBlends(
  lines: readonly LampLine[],
  pairs: readonly { wavelengthNm: number; lineId?: string }[],
): LampLine[] {
  const withBlends = [...lines];
  for (const p of pairs) {
    const member = withBlends.find((l) => l.id === p.lineId);
    const id = `blend:${p.lineId}`;
    if (
      member &&
      Math.abs(member.wavelengthNm - p.wavelengthNm) > 1e-9 &&
      !withBlends.some((l) => l.id === id)
    ) {
      withBlends.push({
        wavelengthNm: p.wavelengthNm,
        intensity: member.intensity,
        species: member.species,
        id,
      });
    }
  }
  return withBlends.sort((a, b) => a.wavelengthNm - b.wavelengthNm);
}
