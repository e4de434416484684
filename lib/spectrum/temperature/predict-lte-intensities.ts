// Relative line intensities expected in local thermodynamic equilibrium at a given temperature.

import { BOLTZMANN_CONSTANT_EV_PER_K } from "./boltzmann-constant";
import { assertPositiveFinite } from "../units/assert-positive-finite";
import { assertNonNegativeFinite } from "../units/assert-non-negative-finite";

/** A line of one species with the atomic data the prediction needs. */
export interface LteLine {
  /** Wavelength in nm. */
  wavelengthNm: number;
  /** Statistical weight of the upper level. */
  g: number;
  /** Transition probability in s⁻¹. */
  a: number;
  /** Upper-level energy in eV. */
  upperEv: number;
}

export interface PredictLteIntensitiesOptions {
  /** Excitation temperature in kelvin.
   * @default 2500 (a typical flame; common practice) */
  temperatureK?: number;
}

/**
 * I ∝ g·A/λ·exp(−E_upper/kT) (emitted power per line; the partition function cancels within one
 * species), normalised so the strongest line is 1. Same order as the input.
 */
export function predictLteIntensities(
  lines: readonly LteLine[],
  options: PredictLteIntensitiesOptions = {},
): Float64Array {
  const { temperatureK = 2500 } = options;
  assertPositiveFinite(temperatureK, "temperatureK");
  const kT = BOLTZMANN_CONSTANT_EV_PER_K * temperatureK;
  const logs = new Float64Array(lines.length);
  lines.forEach((line, i) => {
    for (const key of ["wavelengthNm", "g", "a"] as const) {
      assertPositiveFinite(line[key], `line ${i}: ${key}`);
    }
    assertNonNegativeFinite(line.upperEv, `line ${i}: upperEv`);
    // Work in logarithms so cold temperatures and high energies cannot underflow to 0/0.
    logs[i] = Math.log((line.g * line.a) / line.wavelengthNm) - line.upperEv / kT;
  });
  let highest = -Infinity;
  for (const value of logs) highest = Math.max(highest, value);
  return logs.map((value) => Math.exp(value - highest));
}
