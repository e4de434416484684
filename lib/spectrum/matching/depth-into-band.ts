// How far a wavelength lies from a band's head into the band, the way the band degrades: positive
// inside (towards its tail), negative on the open side of the head.
import type { BandInfo } from "../types";

export function depthIntoBandNm(band: BandInfo, headNm: number, nm: number): number {
  return band.degradesTo === "red" ? nm - headNm : headNm - nm;
}
