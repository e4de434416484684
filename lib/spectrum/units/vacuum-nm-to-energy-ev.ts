// Vacuum wavelength (nm) to photon energy (eV). Photon energy follows from the VACUUM wavelength (E = hc/λ_vac).
import { assertPositiveFinite } from "./assert-positive-finite";
import { HC_EV_NM } from "./physical-constants";

/** Photon energy in eV for the vacuum wavelength `vacuumNm`, with h and c from CODATA 2018. */
export function vacuumNmToEnergyEv(vacuumNm: number): number {
  assertPositiveFinite(vacuumNm, "vacuumNm");
  return HC_EV_NM / vacuumNm;
}
