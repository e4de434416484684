// Relative intensities of each species' lines for one kind of source, with a documented fallback.

import type { SourceKind } from "../types";
import type { LineIndex } from "./prepare-line-index";

export { INTENSITY_FALLBACK_ORDER } from "./intensity-fallback-order";

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
 * strongest lines shows it. A view, as maps, of what prepareLineIndex worked out; cached per index
 * and source.
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

  const result = new Map<string, SpeciesIntensities>();
  for (const entry of index.species) {
    const { basis, relative } = entry.bySource[source];
    const byLine = new Map<number, number>();
    const lineIndices = Array.from(entry.order).sort((a, b) => a - b);
    for (const lineIndex of lineIndices) {
      const value = relative[index.positionInSpecies[lineIndex]];
      if (!Number.isNaN(value)) byLine.set(lineIndex, value);
    }
    result.set(entry.species, {
      species: entry.species,
      element: entry.element,
      ionStage: entry.ionStage,
      lineIndices,
      basis,
      relative: byLine,
    });
  }
  bySource.set(source, result);
  return result;
}
