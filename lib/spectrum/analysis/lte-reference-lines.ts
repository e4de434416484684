// The line table with one kind of source's relative intensities replaced by an LTE prediction at an
// assumed excitation temperature, for the species whose lines carry the atomic data for it.
import { predictLteIntensities } from "../temperature/predict-lte-intensities";
import type { ReferenceLine, SourceKind } from "../types";
import { assertPositiveFinite } from "../units/assert-positive-finite";

/** Scale of the predicted intensities (the strongest predicted line of a species gets this). */
const LTE_SCALE = 1000;

const hasAtomicData = (
  l: ReferenceLine,
): l is ReferenceLine & { g: number; a: number; upperEv: number } =>
  !l.flags.bandHead &&
  l.g !== undefined &&
  l.g > 0 &&
  l.a !== undefined &&
  l.a > 0 &&
  l.upperEv !== undefined &&
  l.upperEv >= 0;

/**
 * A copy of `lines` in which, for every species with at least `minLines` lines carrying g, A and an
 * upper-level energy, `intensities[source]` is g·A/λ·exp(−E/kT) on a 0…1000 scale for those lines and
 * removed for the species' other lines (one species' scale is never mixed with the table's own).
 * Other species keep the table's values. The input is not changed.
 */
export function lteReferenceLines(
  lines: readonly ReferenceLine[],
  source: SourceKind,
  temperatureK: number,
  minLines = 2,
): ReferenceLine[] {
  assertPositiveFinite(temperatureK, "temperatureK");
  const bySpecies = new Map<string, number[]>();
  lines.forEach((l, i) => {
    if (!hasAtomicData(l)) return;
    const list = bySpecies.get(l.species) ?? [];
    list.push(i);
    bySpecies.set(l.species, list);
  });
  const predicted = new Map<number, number>();
  const rewritten = new Set<string>();
  for (const [species, indices] of bySpecies) {
    if (indices.length < minLines) continue;
    rewritten.add(species);
    const values = predictLteIntensities(
      indices.map((i) => {
        const l = lines[i] as ReferenceLine & { g: number; a: number; upperEv: number };
        return { wavelengthNm: l.airNm, g: l.g, a: l.a, upperEv: l.upperEv };
      }),
      { temperatureK },
    );
    indices.forEach((lineIndex, k) => predicted.set(lineIndex, values[k] * LTE_SCALE));
  }
  return lines.map((l, i) => {
    if (!rewritten.has(l.species)) return l;
    const intensities = { ...l.intensities };
    const value = predicted.get(i);
    if (value !== undefined && value > 0) intensities[source] = value;
    else delete intensities[source];
    return { ...l, intensities };
  });
}
