// Excitation temperature from a Boltzmann plot of lines of one species with known g, A and upper energy.

import { BOLTZMANN_CONSTANT_EV_PER_K } from "./boltzmann-constant";
import { assertNonNegativeFinite } from "../units/assert-non-negative-finite";
import { assertPositiveFinite } from "../units/assert-positive-finite";

/** One observed line with the atomic data a Boltzmann plot needs. */
export interface BoltzmannLine {
  /** Wavelength in nm. */
  wavelengthNm: number;
  /** Observed intensity (area or height, consistently for all lines), > 0. */
  intensity: number;
  /** Statistical weight of the upper level. */
  g: number;
  /** Transition probability in s⁻¹. */
  a: number;
  /** Upper-level energy in eV. */
  upperEv: number;
}

export interface BoltzmannPlotOptions {
  /** Fewest lines accepted; three leaves one degree of freedom for the fit's uncertainty.
   * @default 3 */
  minLines?: number;
  /** Smallest accepted spread of upper-level energies in eV; below ~0.5 eV the slope, and so the
   * temperature, is poorly defined (common practice).
   * @default 0.5 */
  minEnergySpreadEv?: number;
}

export interface BoltzmannPoint {
  upperEv: number;
  /** ln(I·λ/(g·A)), with λ in nm and A in s⁻¹. */
  y: number;
}

export type BoltzmannPlotResult =
  | {
      ok: true;
      points: BoltzmannPoint[];
      /** Slope of y against upper energy, in eV⁻¹; equals −1/(kT). */
      slopePerEv: number;
      slopeUncertaintyPerEv: number;
      intercept: number;
      temperatureK: number;
      /** One-sigma uncertainty of the temperature from the slope's standard error. */
      temperatureUncertaintyK: number;
      rSquared: number;
      degreesOfFreedom: number;
    }
  | {
      ok: false;
      reason: "too-few-lines" | "energy-spread-too-small" | "non-physical-slope";
      message: string;
      points: BoltzmannPoint[];
    };

/**
 * Fits y = ln(Iλ/(gA)) = c − E_upper/(kT) by ordinary (unweighted) least squares, as the
 * intensities' uncertainties are rarely known for every line. The temperature's uncertainty is
 * propagated from the slope's standard error: σ_T = σ_b/(k·b²). Refuses (a typed result, not a
 * throw) with fewer than minLines lines, an energy spread below minEnergySpreadEv, or a slope
 * that is not negative.
 */
export function boltzmannPlot(
  lines: readonly BoltzmannLine[],
  options: BoltzmannPlotOptions = {},
): BoltzmannPlotResult {
  const { minLines = 3, minEnergySpreadEv = 0.5 } = options;
  if (!Number.isInteger(minLines) || minLines < 3) {
    throw new RangeError(`minLines must be an integer ≥ 3, got ${minLines}`);
  }
  if (!(minEnergySpreadEv >= 0)) {
    throw new RangeError(`minEnergySpreadEv must be ≥ 0, got ${minEnergySpreadEv}`);
  }
  lines.forEach(assertLine);
  const points = lines.map((line) => ({
    upperEv: line.upperEv,
    y: Math.log((line.intensity * line.wavelengthNm) / (line.g * line.a)),
  }));

  if (points.length < minLines) {
    return {
      ok: false,
      reason: "too-few-lines",
      message: `A Boltzmann plot needs at least ${minLines} lines; got ${points.length}.`,
      points,
    };
  }
  const energies = points.map((p) => p.upperEv);
  const spreadEv = Math.max(...energies) - Math.min(...energies);
  if (spreadEv < minEnergySpreadEv) {
    return {
      ok: false,
      reason: "energy-spread-too-small",
      message: `Upper-level energies span ${spreadEv.toFixed(3)} eV; at least ${minEnergySpreadEv} eV is needed for a usable slope.`,
      points,
    };
  }

  const n = points.length;
  const meanX = energies.reduce((s, e) => s + e, 0) / n;
  const meanY = points.reduce((s, p) => s + p.y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (const p of points) {
    sxx += (p.upperEv - meanX) ** 2;
    sxy += (p.upperEv - meanX) * (p.y - meanY);
    syy += (p.y - meanY) ** 2;
  }
  const slopePerEv = sxy / sxx;
  const intercept = meanY - slopePerEv * meanX;
  let residualSumOfSquares = 0;
  for (const p of points) residualSumOfSquares += (p.y - intercept - slopePerEv * p.upperEv) ** 2;
  const degreesOfFreedom = n - 2;
  const slopeUncertaintyPerEv = Math.sqrt(residualSumOfSquares / degreesOfFreedom / sxx);
  const rSquared = syy > 0 ? 1 - residualSumOfSquares / syy : 1;

  if (!(slopePerEv < 0)) {
    return {
      ok: false,
      reason: "non-physical-slope",
      message: `The fitted slope ${slopePerEv.toPrecision(3)} eV⁻¹ is not negative, so no excitation temperature follows.`,
      points,
    };
  }
  const temperatureK = -1 / (BOLTZMANN_CONSTANT_EV_PER_K * slopePerEv);
  const temperatureUncertaintyK =
    slopeUncertaintyPerEv / (BOLTZMANN_CONSTANT_EV_PER_K * slopePerEv ** 2);
  return {
    ok: true,
    points,
    slopePerEv,
    slopeUncertaintyPerEv,
    intercept,
    temperatureK,
    temperatureUncertaintyK,
    rSquared,
    degreesOfFreedom,
  };
}

function assertLine(line: BoltzmannLine, position: number): void {
  for (const key of ["wavelengthNm", "intensity", "g", "a"] as const) {
    assertPositiveFinite(line[key], `line ${position}: ${key}`);
  }
  assertNonNegativeFinite(line.upperEv, `line ${position}: upperEv`);
}
