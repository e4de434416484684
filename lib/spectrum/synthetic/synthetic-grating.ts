// The invented bench grating of the demo data and the integration tests.
import {
  SYNTHETIC_PIXELS,
  syntheticInstrument,
  type SyntheticInstrument,
} from "./synthetic-instrument";

/** A grating with a cubic dispersion over 350–900 nm, blue at low pixels. */
export function syntheticGrating(): SyntheticInstrument {
  return syntheticInstrument("grating", (px) => {
    const u = px / (SYNTHETIC_PIXELS - 1);
    return 350 + 530 * u + 30 * u * u - 10 * u * u * u;
  });
}
