// Relative intensities of each species' lines for one kind of source, with a documented fallback.

import type { ReferenceLine, SourceKind } from "../types";
import type { LineIndex } from "./prepare-line-index";

/** Where a species' intensities came from when the chosen source has none. */
export const INTENSITY_FALLBACK_ORDER: Readonly<Record<SourceKind, readonly SourceKind[]>> = {
  flame: ["arc", "plasma", "spark", "lamp"],
  arc: ["spark", "plasma", "flame", "lamp"],
  spark: ["arc", "plasma", "flame", "lamp"],
  plasma: ["arc", "spark", "flame", "lamp"],
  lamp: ["arc", "spark", "plasma", "flame"],
};

/** The lines of one species and their intensities relative to its strongest line. */
export interface SpeciesIntensities {
  species: string;
  element: string;
  ionStage: number | null;
  /** Positions in the table of all the species' lines (whole table, not just the range). */
  lineIndices: number[];
  /** The kind of source whose values were used; "none" when the table has none for the species. */
  basis: SourceKind | "none";
  /** relative.get(lineIndex) in (0, 1], the strongest line of the species being 1; undefined
   * for a line without a value on the basis ("unrated"). */
  relative: Map<number, number>;
}

const cache = new WeakMap<LineIndex, Map<SourceKind, Map<string, SpeciesIntensities>>>();

/**
 * Per species, the intensities of its lines on one scale: the chosen source's values when any
 * line of the species has one; otherwise the first source in INTENSITY_FALLBACK_ORDER that has
 * values (so scales of different sources are never mixed within a species); otherwise none.
 * Normalised to the species' strongest line in the whole table, so that a range that misses the
 * strongest lines shows it. Cached per index and source.
 */
export function speciesRelativeIntensities(
  index: LineIndex,
  source: SourceKind,
): Map<string, SpeciesIntensities> {
  let bySource = cache.get(index);
  if (!bySource) {
    bySource = new Map();
    cache.set(index, bySource);
  }
  const cached = bySource.get(source);
  if (cached) return cached;

  const grouped = new Map<string, number[]>();
  index.lines.forEach((line, i) => {
    const list = grouped.get(line.species);
    if (list) list.push(i);
    else grouped.set(line.species, [i]);
  });

  const result = new Map<string, SpeciesIntensities>();
  for (const [species, lineIndices] of grouped) {
    const first: ReferenceLine = index.lines[lineIndices[0]];
    const basis =
      [source, ...INTENSITY_FALLBACK_ORDER[source]].find((kind) =>
        lineIndices.some((i) => positive(index.lines[i].intensities[kind])),
      ) ?? "none";
    const relative = new Map<number, number>();
    if (basis !== "none") {
      let strongest = 0;
      for (const i of lineIndices) {
        const value = index.lines[i].intensities[basis];
        if (positive(value)) strongest = Math.max(strongest, value);
      }
      for (const i of lineIndices) {
        const value = index.lines[i].intensities[basis];
        if (positive(value)) relative.set(i, value / strongest);
      }
    }
    result.set(species, {
      species,
      element: first.element,
      ionStage: first.ionStage,
      lineIndices,
      basis,
      relative,
    });
  }
  bySource.set(source, result);
  return result;
}

function positive(value: number | undefined): value is number {
  return value !== undefined && Number.isFinite(value) && value > 0;
}
