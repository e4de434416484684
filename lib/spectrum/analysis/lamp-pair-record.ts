// A fitted lamp pair in the shape the workbench shows and the saved calibration stores.
import type { LampPairRecord } from "./edit-lamp-calibration-types";

/** A fitted pair as the workbench and the saved calibration list it. */
export function lampPairRecord(pair: {
  x: number;
  wavelengthNm: number;
  residualNm: number;
  species?: string;
  lineId?: string;
}): LampPairRecord {
  return {
    pixel: pair.x,
    wavelengthNm: pair.wavelengthNm,
    residualNm: pair.residualNm,
    species: pair.species ?? null,
    lineId: pair.lineId ?? null,
  };
}
