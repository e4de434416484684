// Builds the pair of one lamp peak and one lamp line, pointing back into the pairing's arrays.
import type { LampPair } from "./lamp-pairing-types";
import type { PairingContext } from "./refine-lamp-pairing";

export function toLampPair(context: PairingContext, peakIndex: number, lineIndex: number): LampPair {
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
