// Builds the pair of one lamp peak and one lamp line, pointing back into the pairing's arrays.
import type { LampLine, LampPair, LampPeak } from "./lamp-pairing-types";

export function toLampPair(
  context: { peaks: readonly LampPeak[]; lines: readonly LampLine[] },
  peakIndex: number,
  lineIndex: number,
): LampPair {
  const peak = context.peaks[peakIndex];
  const line = context.lines[lineIndex];
  return {
    x: peak.x,
    ...(peak.xUncertainty !== undefined ? { xUncertainty: peak.xUncertainty } : {}),
    wavelengthNm: line.wavelengthNm,
    species: line.species,
    lineId: line.id,
    peakIndex,
    lineIndex,
  };
}
