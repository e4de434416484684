// The invented bench prism of the demo data and the integration tests.
import { prismInverseWavelengths, type PrismGeometry } from "../calibration/prism-forward";
import {
  SYNTHETIC_PIXELS,
  syntheticInstrument,
  type SyntheticInstrument,
} from "./synthetic-instrument";

/** A 60° F2 prism near minimum deviation, imaged over 2048 pixels (≈ 355–905 nm), blue at low pixels. */
export function syntheticPrism(): SyntheticInstrument {
  const geometry: PrismGeometry = {
    glass: "F2",
    incidenceRad: (52 * Math.PI) / 180,
    apexRad: Math.PI / 3,
    focalX: 16000,
    axisX: 1230,
    direction: 1,
    referenceWavelengthNm: 480,
  };
  const wavelengths = prismInverseWavelengths(
    geometry,
    Float64Array.from({ length: SYNTHETIC_PIXELS }, (_, i) => i),
  );
  return syntheticInstrument("prism", (px) => {
    const i = Math.min(SYNTHETIC_PIXELS - 2, Math.max(0, Math.floor(px)));
    return wavelengths[i] + (wavelengths[i + 1] - wavelengths[i]) * (px - i);
  });
}
