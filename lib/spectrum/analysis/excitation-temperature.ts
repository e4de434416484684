// The excitation temperature of a sample from a Boltzmann plot of one species' identified lines:
// the species called present with the most lines that carry g, A and an upper-level energy.
import type { ElementCall } from "../matching/score-elements-types";
import { boltzmannPlot, type BoltzmannLine } from "../temperature/boltzmann-plot";
import type { CalibratedPeak } from "../types";

export interface ExcitationTemperatureOptions {
  /** Fewest usable lines for a plot (see boltzmannPlot's minLines).
   * @default 3 */
  minLines?: number;
  /** Smallest spread of upper-level energies in eV (see boltzmannPlot).
   * @default 0.5 */
  minEnergySpreadEv?: number;
}

export type ExcitationTemperature =
  | {
      ok: true;
      species: string;
      temperatureK: number;
      /** One-sigma uncertainty from the slope's standard error. */
      temperatureUncertaintyK: number;
      lineCount: number;
      rSquared: number;
      /** The plot's points: y = ln(I·λ/(g·A)) against the upper-level energy. */
      points: { upperEv: number; y: number; wavelengthNm: number }[];
    }
  | { ok: false; message: string };

/**
 * Lines usable for one species: seen lines with g, A and upper energy, on peaks that are neither
 * saturated (a clipped top under-reads the area) nor blended, carry no other species' line, and
 * hold only this one line of the species (an unresolved multiplet's area belongs to several lines).
 * The intensity is the peak's area on the input axis: on a pixel axis that is the line's total
 * counts, the quantity proportional to the power it emits.
 */
export function usableBoltzmannLines(
  call: ElementCall,
  peaks: readonly CalibratedPeak[],
): BoltzmannLine[] {
  const shared = new Set(call.overlaps.map((o) => o.peakIndex));
  const perPeak = new Map<number, number>();
  for (const s of call.seen) perPeak.set(s.peakIndex, (perPeak.get(s.peakIndex) ?? 0) + 1);
  const lines: BoltzmannLine[] = [];
  for (const s of call.seen) {
    const { g, a, upperEv } = s.line;
    const peak = peaks[s.peakIndex];
    if (g === undefined || a === undefined || upperEv === undefined || !peak) continue;
    if (!(g > 0) || !(a > 0) || !(upperEv >= 0) || !(peak.area > 0) || !Number.isFinite(peak.area))
      continue;
    if (peak.saturated || peak.blended || shared.has(s.peakIndex) || perPeak.get(s.peakIndex)! > 1)
      continue;
    lines.push({ wavelengthNm: s.referenceNm, intensity: peak.area, g, a, upperEv });
  }
  return lines;
}

/**
 * Tries the species called present in order of usable lines (most first) and returns the first
 * plot that gives a temperature; otherwise why none could be found, for the best candidate.
 */
export function excitationTemperature(
  calls: readonly ElementCall[],
  peaks: readonly CalibratedPeak[],
  options: ExcitationTemperatureOptions = {},
): ExcitationTemperature {
  const { minLines = 3, minEnergySpreadEv = 0.5 } = options;
  const candidates = calls
    .filter((c) => c.verdict === "present")
    .map((c) => ({ call: c, lines: usableBoltzmannLines(c, peaks) }))
    .filter((c) => c.lines.length > 0)
    .sort(
      (p, q) => q.lines.length - p.lines.length || p.call.species.localeCompare(q.call.species),
    );
  if (candidates.length === 0) {
    return {
      ok: false,
      message:
        "no species called present has a seen line with a statistical weight, a transition probability and an upper-level energy in the line table.",
    };
  }
  let firstFailure: string | null = null;
  for (const { call, lines } of candidates) {
    const plot = boltzmannPlot(lines, { minLines, minEnergySpreadEv });
    if (plot.ok) {
      return {
        ok: true,
        species: call.species,
        temperatureK: plot.temperatureK,
        temperatureUncertaintyK: plot.temperatureUncertaintyK,
        lineCount: lines.length,
        rSquared: plot.rSquared,
        points: plot.points.map((p, i) => ({
          upperEv: p.upperEv,
          y: p.y,
          wavelengthNm: lines[i].wavelengthNm,
        })),
      };
    }
    firstFailure ??= `${call.species} (${lines.length} usable line${lines.length === 1 ? "" : "s"}): ${plot.message}`;
  }
  return { ok: false, message: `the best candidate was ${firstFailure}` };
}
