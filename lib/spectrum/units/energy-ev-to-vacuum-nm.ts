// Photon energy (eV) to wavelength (nm); the result is a vacuum wavelength (λ_vac = hc/E).
import { assertPositiveFinite } from "./assert-positive-finite";
import { HC_EV_NM } from "./physical-constants";

/** Vacuum wavelength in nm of a photon of energy `energyEv`, with h and c from CODATA 2018. */
export function energyEvToVacuumNm(energyEv: number): number {
  assertPositiveFinite(energyEv, "energyEv");
  return HC_EV_NM / energyEv;
}
